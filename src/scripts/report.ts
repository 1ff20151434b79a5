/**
 * The region report's small script (the page works without it):
 * - the hour table's "mark hours above the limit for" control: shown only with JavaScript; it
 *   marks the cells whose `data-above-<state>` lists the chosen class (class `above`);
 * - the scenario switch: the baseline beside every scenario, or beside the one chosen;
 * - before printing, every closed <details> is opened (and closed again afterwards) except those
 *   the print leaves out (`.print-omit`), and the source line and the downloads line get full
 *   addresses (`data-page-url`, `data-print-url`: the page's own origin and base).
 */

function setupMarking(): void {
  const form = document.querySelector<HTMLFormElement>('[data-mark-control]');
  const table = document.querySelector<HTMLTableElement>('#hour-table');
  if (!form || !table) return;
  const names = JSON.parse(table.dataset.classNames ?? '{}') as Record<string, string>;
  const label = table.querySelector<HTMLElement>('[data-mark-label]');
  const apply = () => {
    const cls = (form.elements.namedItem('class') as HTMLSelectElement).value;
    const state = (form.querySelector<HTMLInputElement>('input[name="state"]:checked')?.value ?? table.dataset.markState) as string;
    table.dataset.markClass = cls;
    table.dataset.markState = state;
    for (const td of table.querySelectorAll<HTMLTableCellElement>('tbody td')) {
      const above = (td.getAttribute(`data-above-${state}`) ?? '').split(' ').includes(cls);
      td.classList.toggle('above', above);
    }
    if (label) label.textContent = `${names[cls] ?? cls}, ${state} workers`;
  };
  form.hidden = false;
  form.addEventListener('change', apply);
  form.addEventListener('submit', (e) => e.preventDefault());
}

/**
 * The scenario switch (shown only with JavaScript): "every scenario" shows the baseline and every
 * scenario side by side; one scenario shows the baseline beside it alone, with its description.
 */
function setupScenarioSwitch(): void {
  const form = document.querySelector<HTMLFormElement>('[data-scenario-switch]');
  const section = document.querySelector<HTMLElement>('#scenarios');
  if (!form || !section) return;
  const select = form.querySelector<HTMLSelectElement>('select');
  if (!select) return;
  const apply = () => {
    const chosen = select.value;
    section.dataset.scenario = chosen;
    for (const el of section.querySelectorAll<HTMLElement>('[data-column]')) {
      const c = el.dataset.column;
      el.hidden = !(chosen === 'all' || c === 'baseline' || c === chosen);
    }
    for (const el of section.querySelectorAll<HTMLElement>('[data-scenario-about]')) el.hidden = !(chosen === 'all' || el.dataset.scenarioAbout === chosen);
  };
  form.hidden = false;
  select.addEventListener('change', apply);
  form.addEventListener('submit', (e) => e.preventDefault());
  apply();
}

function setupPrint(): void {
  let opened: HTMLDetailsElement[] = [];
  window.addEventListener('beforeprint', () => {
    opened = [...document.querySelectorAll<HTMLDetailsElement>('details:not([open]):not(.print-omit)')];
    for (const d of opened) d.open = true;
  });
  window.addEventListener('afterprint', () => {
    for (const d of opened) d.open = false;
    opened = [];
  });
  for (const el of document.querySelectorAll<HTMLElement>('[data-page-url]')) el.textContent = location.href.split('?')[0];
  for (const el of document.querySelectorAll<HTMLElement>('[data-print-url]')) el.textContent = new URL(el.dataset.printUrl ?? '', location.href).href;
}

setupMarking();
setupScenarioSwitch();
setupPrint();
