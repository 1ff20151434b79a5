/**
 * The estimate page's browser code: reads the context from `#estimate-app[data-context]`, fills
 * the form from the URL (every input is a query parameter, so a link reproduces the estimate),
 * and on every change runs the schedule replay (pipeline/schedule: the same code as `heathours
 * estimate`) on the record and on each what-if climate ticked, then shows them or the catalogued
 * error. Loaded only when needed (their own chunks): the monthly table (monthly-detail.ts, when
 * its <details> is open) and the CSV writer (on the first click of the CSV link).
 * `data-state` on `#estimate-app` is `loading`, `ready` or `error`; `data-run` counts finished
 * runs and `data-ms` holds the last run's time from input to results shown [ms] (tests and the
 * benchmark wait on them).
 */
import { HeathoursError } from '../../../pipeline/model/errors.ts';
import { bidFigures, type BidFigures } from '../../../pipeline/schedule/bid-figures.ts';
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import { parseInputs, parseScenarios, placeFromQuery } from '../../../pipeline/schedule/inputs.ts';
import { loadPlace } from '../../../pipeline/schedule/place.ts';
import { runBidKeepingSchedule, runScenarios } from '../../../pipeline/schedule/scenario-runs.ts';
import { jobLines, placeText, settingLines, weatherLine } from '../../../pipeline/schedule/settings-text.ts';
import { estimateFileName } from '../../lib/estimate/file-name.ts';
import { UNIT_EVENT, currentUnit, type TemperatureUnit } from '../../lib/units.ts';
import { siteLoader } from './fetch-tiles.ts';
import { convertTemperatureFields, fillFromQuery, queryOf, readRaw, updateVisibility } from './form.ts';
import { crewText, headline, renderScenarios, renderSchedule, renderShifts, renderStartChart, renderStartMonths, renderYears } from './render-bid.ts';
import { renderSummary, setDownload } from './render.ts';

const app = document.getElementById('estimate-app');
const form = document.getElementById('estimate-form');
const byId = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

if (app && form instanceof HTMLFormElement) {
  const { ctx, atlasTitle, base, colour } = JSON.parse(app.dataset.context ?? '{}') as {
    ctx: EstimateContext;
    atlasTitle: string;
    base: string;
    colour: string;
  };
  const load = siteLoader(base);
  const status = byId('estimate-status');
  const errorBox = byId('estimate-error');
  const output = byId('estimate-output');
  /** The unit the typed temperatures are in (the page is rendered in °C). */
  let shownUnit: TemperatureUnit = 'C';
  let runs = 0;
  let latest = 0;
  const monthlyBox = form.ownerDocument.querySelector<HTMLDetailsElement>('details.estimate-monthly');
  /** The estimate shown, for the downloads made on demand, and which of them are made. */
  let shown: { figures: BidFigures; name: (ext: string) => string; csv: boolean; json: boolean } | null = null;

  const showError = (e: unknown) => {
    errorBox.replaceChildren();
    const title = document.createElement('p');
    const strong = document.createElement('strong');
    const message = document.createElement('p');
    const hint = document.createElement('p');
    hint.className = 'error-hint';
    if (e instanceof HeathoursError) {
      strong.textContent = e.title;
      message.textContent = e.message;
      hint.textContent = `What to do: ${e.hint}`;
      errorBox.dataset.code = e.code;
    } else {
      strong.textContent = 'The estimate failed';
      message.textContent = String((e as Error)?.message ?? e);
      hint.textContent = 'This is a fault of the calculator, not of your input; please report it with the settings used.';
      errorBox.dataset.code = 'internal';
      console.error(e);
    }
    title.append(strong);
    errorBox.append(title, message, hint);
    errorBox.hidden = false;
    output.hidden = true;
    status.textContent = 'No estimate: see the message below.';
    app.dataset.state = 'error';
  };

  const run = async () => {
    const id = ++latest;
    const t0 = performance.now();
    app.dataset.state = 'loading';
    updateVisibility(form, ctx);
    try {
      const raw = readRaw(form);
      const inputs = parseInputs(raw, ctx, shownUnit);
      const { place, histograms } = await loadPlace(inputs.place, ctx, load);
      if (id !== latest) return;
      const { run: bid, deadlineProblem: deadlineError } = runBidKeepingSchedule(histograms, inputs, ctx);
      const scenarios = await runScenarios(inputs, ctx, load);
      if (id !== latest) return;
      const json: BidFigures = bidFigures(bid, inputs, ctx, place, scenarios);
      const unit = currentUnit();
      const limit = { limitWork: bid.kernel.limitWork, threshold: bid.kernel.threshold };
      renderSummary(
        byId('bid-settings'),
        [...settingLines(inputs, ctx, place, limit), ...jobLines(inputs), weatherLine(ctx, json.weatherYears, json.weatherYearsLeftOut)],
        unit,
      );
      byId('bid-headline').textContent = headline(json);
      byId('bid-place').textContent = placeText(place);
      renderSchedule(byId<HTMLTableElement>('bid-schedule').tBodies[0], json);
      renderYears(byId<HTMLTableElement>('bid-years').tBodies[0], json);
      renderStartMonths(byId<HTMLTableElement>('bid-start-months').tBodies[0], json);
      renderStartChart(document.getElementById('bid-start-chart') as unknown as SVGSVGElement, json, colour);
      renderShifts(byId<HTMLTableElement>('bid-shifts'), json);
      renderScenarios(byId('bid-scenarios'), json);
      byId('bid-crew').textContent = crewText(json, deadlineError);
      byId('bid-build').textContent =
        `${ctx.build.title}${ctx.invented ? ' (INVENTED DATA)' : ''}; built ${ctx.build.buildTime}, code ${ctx.build.codeVersion}, configuration ${ctx.build.configDigest.slice(0, 12)}, ${ctx.build.inputs} input files; weather years ${json.weatherYears.join(', ')}.`;
      const name = (ext: string) => estimateFileName({ inputs }, place, ext, 'bid');
      shown = { figures: json, name, csv: false, json: false };
      if (monthlyBox?.open) {
        const { showMonthly } = await import('./monthly-detail.ts');
        if (id !== latest) return;
        showMonthly(histograms, inputs, ctx, place, atlasTitle, unit);
      }
      errorBox.hidden = true;
      output.hidden = false;
      status.textContent = `Estimate for ${placeText(place)}.`;
      history.replaceState(null, '', `${location.pathname}?${queryOf(raw)}${shownUnit === 'F' ? '&tu=F' : ''}${location.hash}`);
      app.dataset.state = 'ready';
      app.dataset.ms = (performance.now() - t0).toFixed(1);
    } catch (e) {
      if (id !== latest) return;
      showError(e);
    } finally {
      if (id === latest) app.dataset.run = String(++runs);
    }
  };

  const syncUnit = (unit: TemperatureUnit) => {
    convertTemperatureFields(form, shownUnit, unit);
    shownUnit = unit;
  };

  form.hidden = false;
  let badLink = false;
  try {
    placeFromQuery(location.search, ctx); // a bad ?region=, ?cell= or ?lat=&lon= is named as it was given
    parseScenarios(new URLSearchParams(location.search).getAll('scenario'), ctx); // and a scenario the atlas does not have
    fillFromQuery(form, location.search);
  } catch (e) {
    badLink = true;
    showError(e);
    app.dataset.run = String(++runs);
  }
  // Typed temperatures of a link are in the unit it was made in (`tu`), then shown in the page's.
  shownUnit = new URLSearchParams(location.search).get('tu') === 'F' ? 'F' : 'C';
  syncUnit(currentUnit());
  document.addEventListener(UNIT_EVENT, (e) => syncUnit(((e as CustomEvent).detail?.unit as TemperatureUnit) ?? currentUnit()));
  form.addEventListener('change', () => void run());
  form.addEventListener('submit', (e) => {
    e.preventDefault();
    void run();
  });
  document.getElementById('bid-print')?.addEventListener('click', () => window.print());
  // The monthly detail is computed when opened (and on every change while open).
  monthlyBox?.addEventListener('toggle', () => {
    if (monthlyBox.open) void run();
  });
  // The JSON and CSV writers are loaded on the first click of their link (with the notes and
  // cautions the files carry); the link then points at a Blob of this estimate's file.
  const downloadLink = (a: HTMLAnchorElement, kind: 'csv' | 'json') => {
    const make = async () => {
      const s = shown;
      if (!s) return;
      const { bidJsonOf } = await import('../../../pipeline/schedule/bid-json.ts');
      const j = bidJsonOf(s.figures);
      const text = kind === 'json' ? `${JSON.stringify(j, null, 1)}\n` : (await import('../../../pipeline/schedule/bid-csv.ts')).bidCsv(j);
      if (shown !== s) return;
      setDownload(a, text, kind === 'json' ? 'application/json' : 'text/csv;charset=utf-8', s.name(kind));
      s[kind] = true;
      a.click();
    };
    a.addEventListener('click', (e) => {
      if (shown?.[kind]) return; // the Blob of this estimate: the browser downloads it
      e.preventDefault();
      void make();
    });
  };
  downloadLink(byId<HTMLAnchorElement>('bid-csv'), 'csv');
  downloadLink(byId<HTMLAnchorElement>('bid-json'), 'json');
  if (!badLink) void run();
}
