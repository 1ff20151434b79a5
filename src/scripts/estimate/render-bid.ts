/**
 * Draws the bid into the page from the estimate's figures (pipeline/schedule/bid-figures.ts: the
 * object `heathours estimate --json` prints, less its fixed notes): the headline, the schedule
 * table (mean, median, P90 year and the heat-free schedule), the years, the start-month chart and
 * table, the shift patterns, the crew for a deadline, the same job on each scenario. Rows, labels and decimals from pipeline/schedule/bid-table.ts. Text
 * only through textContent; the chart is SVG built with DOM calls (no inline style).
 */
import type { BidFigures as BidJson } from '../../../pipeline/schedule/bid-figures.ts';
import { SCHEDULE_ROWS, STATISTICS, rowUnit, scheduleValue, showValue, type ScheduleKey } from '../../../pipeline/schedule/bid-table.ts';
import { grouped } from '../../../pipeline/schedule/settings-text.ts';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const SVG = 'http://www.w3.org/2000/svg';

function el<K extends keyof HTMLElementTagNameMap>(tag: K, text?: string, cls?: string): HTMLElementTagNameMap[K] {
  const e = document.createElement(tag);
  if (text !== undefined) e.textContent = text;
  if (cls) e.className = cls;
  return e;
}

function row(cells: Array<string | { text: string; num?: boolean; header?: boolean }>, key?: string): HTMLTableRowElement {
  const tr = el('tr');
  if (key) tr.dataset.row = key;
  for (const c of cells) {
    const o = typeof c === 'string' ? { text: c } : c;
    const td = o.header ? el('th', o.text) : el('td', o.text);
    if (o.header) td.setAttribute('scope', 'row');
    if (o.num) td.className = 'num';
    tr.append(td);
  }
  return tr;
}

const rowOf = (k: ScheduleKey) => SCHEDULE_ROWS.find((r) => r.key === k)!;
const show = (v: number | string, k: ScheduleKey) => showValue(v, rowOf(k));

/** The one-sentence answer at the head of the result. */
export function headline(j: BidJson): string {
  const cur = j.costs.currency || 'currency units';
  const n = j.weatherYears.length;
  return (
    `Started ${j.job.start}, the job of ${grouped(j.job.workHours)} crew-hours with ${grouped(j.job.crew)} workers is done by ${j.finishDate.p50} in the median year ` +
    `and by ${j.finishDate.p90} in the 90th-percentile year of ${n} weather year${n === 1 ? '' : 's'} (without heat: ${j.heatFree.finishDate}). ` +
    `Heat adds ${show(j.addedWorkingDays.p50, 'addedWorkingDays')} working days at the median and ${show(j.addedWorkingDays.p90, 'addedWorkingDays')} at P90, ` +
    `and costs ${show(j.cost.mean, 'cost')} ${cur} on average, ${show(j.cost.p90, 'cost')} ${cur} at P90.`
  );
}

/** The schedule table: one row per figure, mean / median / P90 / heat-free. */
export function renderSchedule(tbody: HTMLTableSectionElement, j: BidJson): void {
  tbody.replaceChildren();
  const heatFree: Partial<Record<ScheduleKey, number | string>> = {
    finishDate: j.heatFree.finishDate,
    workingDays: j.heatFree.workingDays,
    calendarDays: j.heatFree.calendarDays,
    addedWorkingDays: 0,
    addedCalendarDays: 0,
    crewHoursLost: 0,
    crewHoursAbove: 0,
    cost: 0,
  };
  for (const r of SCHEDULE_ROWS) {
    tbody.append(
      row(
        [
          { text: `${r.label} [${rowUnit(r, j.costs.currency)}]`, header: true },
          ...STATISTICS.map((s) => ({ text: showValue(scheduleValue(j, r, s.key), r), num: true })),
          { text: showValue(heatFree[r.key] ?? '', r), num: true },
        ],
        r.key,
      ),
    );
  }
}

/** One row per replayed weather year. */
export function renderYears(tbody: HTMLTableSectionElement, j: BidJson): void {
  tbody.replaceChildren();
  for (const y of j.years) {
    tbody.append(
      row([{ text: String(y.weatherYear), header: true }, ...SCHEDULE_ROWS.map((r) => ({ text: showValue(y[r.key], r), num: true }))], String(y.weatherYear)),
    );
  }
}

/** The start-month table: added working days and cost, P50 and P90, and the P90 finish. */
export function renderStartMonths(tbody: HTMLTableSectionElement, j: BidJson): void {
  tbody.replaceChildren();
  j.startMonths.forEach((m, i) => {
    tbody.append(
      row(
        [
          { text: MONTHS[i], header: true },
          m.start,
          { text: show(m.addedWorkingDays.p50, 'addedWorkingDays'), num: true },
          { text: show(m.addedWorkingDays.p90, 'addedWorkingDays'), num: true },
          { text: show(m.cost.p50, 'cost'), num: true },
          { text: show(m.cost.p90, 'cost'), num: true },
          m.finishDate.p90,
        ],
        String(i + 1),
      ),
    );
  });
}

/**
 * The start-month chart: per month a bar of the median added working days and a tick at the P90
 * year (as the region reports draw means and P90 ticks). `colour` is the reports' first series colour.
 */
export function renderStartChart(svg: SVGSVGElement, j: BidJson, colour: string): void {
  const W = 640;
  const H = 220;
  const m = { top: 12, right: 12, bottom: 28, left: 44 };
  const max = Math.max(1, ...j.startMonths.map((s) => s.addedWorkingDays.p90));
  const step = niceStep(max);
  const top = Math.ceil(max / step) * step;
  const y = (v: number) => m.top + (H - m.top - m.bottom) * (1 - v / top);
  const bw = (W - m.left - m.right) / 12;
  svg.replaceChildren();
  svg.setAttribute('viewBox', `0 0 ${W} ${H}`);
  const add = (tag: string, attrs: Record<string, string | number>, text?: string) => {
    const e = document.createElementNS(SVG, tag);
    for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, String(v));
    if (text !== undefined) e.textContent = text;
    svg.append(e);
    return e;
  };
  for (let v = 0; v <= top + 1e-9; v += step) {
    add('line', { x1: m.left, x2: W - m.right, y1: y(v), y2: y(v), class: 'grid' });
    add('text', { x: m.left - 6, y: y(v) + 4, 'text-anchor': 'end', class: 'tick' }, grouped(v, step < 1 ? 1 : 0));
  }
  j.startMonths.forEach((s, i) => {
    const x = m.left + i * bw;
    const b = add('rect', {
      x: x + bw * 0.2,
      y: y(s.addedWorkingDays.p50),
      width: bw * 0.6,
      height: Math.max(0, y(0) - y(s.addedWorkingDays.p50)),
      fill: colour,
      'data-month': i + 1,
      'data-p50': s.addedWorkingDays.p50,
    });
    const t = document.createElementNS(SVG, 'title');
    t.textContent = `${MONTHS[i]}: ${show(s.addedWorkingDays.p50, 'addedWorkingDays')} days (median), ${show(s.addedWorkingDays.p90, 'addedWorkingDays')} (P90)`;
    b.append(t);
    add('line', {
      x1: x + bw * 0.12,
      x2: x + bw * 0.88,
      y1: y(s.addedWorkingDays.p90),
      y2: y(s.addedWorkingDays.p90),
      class: 'p90-tick',
      'data-p90': s.addedWorkingDays.p90,
    });
    add('text', { x: x + bw / 2, y: H - 10, 'text-anchor': 'middle', class: 'tick' }, MONTHS[i]);
  });
  add('text', { x: 4, y: 10, class: 'tick' }, 'days');
}

function niceStep(max: number): number {
  const raw = max / 4;
  const p = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 5, 10].map((k) => k * p).find((s) => s >= raw) ?? raw;
}

/** The shift patterns side by side: one column per pattern. */
export function renderShifts(table: HTMLTableElement, j: BidJson): void {
  const head = table.tHead ?? table.createTHead();
  head.replaceChildren(
    row([{ text: 'Figure', header: false }, ...j.shiftPatterns.map((p) => `${p.shift.join(' and ')}, ${p.days} (${p.hoursPerDay} h a day)`)]),
  );
  for (const th of head.querySelectorAll('td')) {
    const h = el('th', th.textContent ?? '');
    h.setAttribute('scope', 'col');
    th.replaceWith(h);
  }
  const body = table.tBodies[0] ?? table.createTBody();
  body.replaceChildren();
  const lines: Array<[string, (p: BidJson['shiftPatterns'][number]) => string]> = [
    ['Finish without heat', (p) => p.heatFree.finishDate],
    ['Finish, median year', (p) => p.finishDate.p50],
    ['Finish, P90 year', (p) => p.finishDate.p90],
    ['Calendar days, P90 year', (p) => show(p.calendarDays.p90, 'calendarDays')],
    [
      'Working days added by heat, median / P90',
      (p) => `${show(p.addedWorkingDays.p50, 'addedWorkingDays')} / ${show(p.addedWorkingDays.p90, 'addedWorkingDays')}`,
    ],
    ['Crew-hours lost, median / P90', (p) => `${show(p.crewHoursLost.p50, 'crewHoursLost')} / ${show(p.crewHoursLost.p90, 'crewHoursLost')}`],
    [`Cost of heat, median / P90 [${j.costs.currency || 'currency units'}]`, (p) => `${show(p.cost.p50, 'cost')} / ${show(p.cost.p90, 'cost')}`],
  ];
  for (const [label, f] of lines) body.append(row([{ text: label, header: true }, ...j.shiftPatterns.map((p) => ({ text: f(p), num: true }))]));
}

/** The crew for the deadline, or why there is none. */
export function crewText(j: BidJson, error: string | null): string {
  if (error) return error;
  const c = j.crewForDeadline;
  if (!c) return 'Give a deadline to find the smallest crew that meets it in the 90th-percentile year.';
  return `To finish by ${c.deadline} in the 90th-percentile year, the job needs at least ${grouped(c.crew)} workers (P90 finish ${c.finishDate.p90}, median ${c.finishDate.p50}; heat adds ${show(c.addedWorkingDays.p90, 'addedWorkingDays')} working days at P90).`;
}

/** The figures of the what-if table, one row each: label and the value of a run. */
export const SCENARIO_LINES: ReadonlyArray<{
  key: string;
  label: (cur: string) => string;
  value: (x: Pick<BidJson, 'finishDate' | 'addedWorkingDays' | 'cost'>) => string;
}> = [
  { key: 'finish-p50', label: () => 'Finish, median year', value: (x) => x.finishDate.p50 },
  { key: 'finish-p90', label: () => 'Finish, P90 year', value: (x) => x.finishDate.p90 },
  { key: 'added-p50', label: () => 'Working days added by heat, median', value: (x) => show(x.addedWorkingDays.p50, 'addedWorkingDays') },
  { key: 'added-p90', label: () => 'Working days added by heat, P90', value: (x) => show(x.addedWorkingDays.p90, 'addedWorkingDays') },
  { key: 'cost-p50', label: (cur) => `Cost of heat, median [${cur}]`, value: (x) => show(x.cost.p50, 'cost') },
  { key: 'cost-p90', label: (cur) => `Cost of heat, P90 [${cur}]`, value: (x) => show(x.cost.p90, 'cost') },
];

/**
 * The same job on the record and on each scenario, side by side, with what each scenario is and
 * the what-if caveat; the section is hidden when no scenario was run.
 */
export function renderScenarios(section: HTMLElement, j: BidJson): void {
  section.hidden = j.scenarios.length === 0;
  const table = section.querySelector('table')!;
  const head = table.tHead ?? table.createTHead();
  const tr = el('tr');
  for (const [i, text] of ['Figure', 'Record (past weather)', ...j.scenarios.map((s) => s.name)].entries()) {
    const th = el('th', text, i > 0 ? 'num' : undefined);
    th.setAttribute('scope', 'col');
    if (i > 1) th.dataset.scenario = j.scenarios[i - 2].id;
    tr.append(th);
  }
  head.replaceChildren(tr);
  const body = table.tBodies[0] ?? table.createTBody();
  body.replaceChildren();
  const cur = j.costs.currency || 'currency units';
  for (const line of SCENARIO_LINES) {
    body.append(
      row(
        [{ text: line.label(cur), header: true }, { text: line.value(j), num: true }, ...j.scenarios.map((s) => ({ text: line.value(s), num: true }))],
        line.key,
      ),
    );
  }
  section.querySelector('#bid-scenario-caveat')!.textContent = j.scenarioCaveat;
  const words = section.querySelector('#bid-scenario-words')!;
  words.replaceChildren(
    ...j.scenarios.map((s) => {
      const li = el(
        'li',
        `${s.name} (${s.id}, ${s.kind}): ${s.what} Source: ${s.source}${s.deadlineProblem ? ` Crew for the deadline: ${s.deadlineProblem}` : ''}`,
      );
      li.dataset.scenario = s.id;
      return li;
    }),
  );
}
