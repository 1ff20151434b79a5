/**
 * The home page's ranking switches, one per ranking table (`[data-ranking-control]` names its
 * table in `data-for`; each table works without it, ranked by its default column):
 * re-sorts the rows by the chosen column, most hours first, rows without a value last, equal
 * values in name order (the server's `data-name-order`), as src/lib/report/ranking.ts does.
 * With what-if climates, the climate switch (`[data-ranking-scenario-control]`) shows the ranking
 * of the record (default) or of one scenario (`[data-ranking-scenario]` blocks) with that
 * scenario's words; without JavaScript every climate's ranking and words show.
 */
import { compareForRanking } from '../lib/report/ranking.ts';

for (const form of document.querySelectorAll<HTMLFormElement>('[data-ranking-control]')) {
  const table = document.getElementById(form.dataset.for ?? 'ranking');
  if (table instanceof HTMLTableElement) wire(form, table);
}

function wire(form: HTMLFormElement, table: HTMLTableElement): void {
  const body = table.tBodies[0];
  const select = form.elements.namedItem('column') as HTMLSelectElement;
  const cellValue = (tr: HTMLTableRowElement, key: string) => {
    const raw = tr.querySelector<HTMLElement>(`td[data-col="${CSS.escape(key)}"]`)?.dataset.value ?? '';
    return raw === '' ? NaN : Number(raw);
  };
  const apply = () => {
    const key = select.value;
    const rows = [...body.rows].sort(
      (a, b) => compareForRanking(cellValue(a, key), cellValue(b, key)) || Number(a.dataset.nameOrder) - Number(b.dataset.nameOrder),
    );
    rows.forEach((tr, i) => {
      const rank = tr.querySelector('td.rank');
      if (rank) rank.textContent = String(i + 1);
      body.appendChild(tr);
    });
    table.dataset.sortKey = key;
    for (const cell of table.querySelectorAll<HTMLElement>('[data-col], thead th[data-key]')) {
      const k = cell.dataset.col ?? cell.dataset.key;
      cell.classList.toggle('sorted', k === key);
    }
  };
  form.hidden = false;
  select.addEventListener('change', apply);
  form.addEventListener('submit', (e) => e.preventDefault());
}

const climateForm = document.querySelector<HTMLFormElement>('[data-ranking-scenario-control]');
if (climateForm) {
  const select = climateForm.elements.namedItem('scenario') as HTMLSelectElement;
  const words = document.getElementById('ranking-scenario-about');
  const show = () => {
    const id = select.value;
    for (const block of document.querySelectorAll<HTMLElement>('[data-ranking-scenario]')) block.hidden = block.dataset.rankingScenario !== id;
    // The chosen scenario's words and the caveat; the record needs none.
    if (words) {
      words.hidden = id === '';
      for (const li of words.querySelectorAll<HTMLElement>('[data-scenario-about]')) li.hidden = li.dataset.scenarioAbout !== id;
    }
  };
  climateForm.hidden = false;
  select.addEventListener('change', show);
  climateForm.addEventListener('submit', (e) => e.preventDefault());
  show();
}
