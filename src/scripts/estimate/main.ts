/**
 * The estimate calculator's browser code: reads the context from `#estimate-app[data-context]`,
 * the place from `?region=` / `?cell=`, runs the estimate (src/lib/estimate) whenever the form
 * changes, and shows the result or the catalogued error. `data-state` on `#estimate-app` is
 * `loading`, `ready` or `error`; `data-run` counts finished runs (tests wait on it).
 */
import { HeathoursError } from '../../../pipeline/model/errors.ts';
import type { EstimateContext } from '../../lib/estimate/context.ts';
import { runEstimate } from '../../lib/estimate/estimate.ts';
import { parseInputs, placeFromQuery } from '../../lib/estimate/inputs.ts';
import { placeLabel } from '../../lib/estimate/summary.ts';
import { UNIT_EVENT, currentUnit, type TemperatureUnit } from '../../lib/units.ts';
import { placeHistograms } from './fetch-tiles.ts';
import { convertTemperatureFields, readRaw, setPlace, updateVisibility } from './form.ts';
import { renderCsvLink, renderSummary, renderTable } from './render.ts';

const app = document.getElementById('estimate-app');
const form = document.getElementById('estimate-form');

if (app && form instanceof HTMLFormElement) {
  const { ctx, atlasTitle, base } = JSON.parse(app.dataset.context ?? '{}') as { ctx: EstimateContext; atlasTitle: string; base: string };
  const status = document.getElementById('estimate-status')!;
  const errorBox = document.getElementById('estimate-error')!;
  const output = document.getElementById('estimate-output')!;
  const summary = document.getElementById('estimate-summary')!;
  const tbody = document.querySelector<HTMLTableSectionElement>('#estimate-table tbody')!;
  const csvLink = document.getElementById('estimate-csv') as HTMLAnchorElement;
  /** The unit the typed temperatures are in (the page is rendered in °C). */
  let shownUnit: TemperatureUnit = 'C';
  let runs = 0;
  let latest = 0;

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
    } else {
      strong.textContent = 'The estimate failed';
      message.textContent = String((e as Error)?.message ?? e);
      hint.textContent = 'This is a fault of the calculator, not of your input; please report it with the settings used.';
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
    app.dataset.state = 'loading';
    updateVisibility(form, ctx);
    try {
      const inputs = parseInputs(readRaw(form), ctx, shownUnit);
      const hist = await placeHistograms(inputs.place, ctx, base);
      if (id !== latest) return;
      const result = runEstimate(hist, inputs, ctx);
      renderSummary(summary, result, ctx, currentUnit());
      renderTable(tbody, result);
      renderCsvLink(csvLink, result, ctx, atlasTitle);
      errorBox.hidden = true;
      output.hidden = false;
      status.textContent = `Estimate for ${placeLabel(result, ctx)}.`;
      const q = new URLSearchParams(location.search);
      q.delete('region');
      q.delete('cell');
      if (inputs.place.kind === 'region') q.set('region', inputs.place.id);
      else q.set('cell', String(inputs.place.cell));
      history.replaceState(null, '', `${location.pathname}?${q.toString()}${location.hash}`);
      app.dataset.state = 'ready';
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
  syncUnit(currentUnit());
  document.addEventListener(UNIT_EVENT, (e) => syncUnit(((e as CustomEvent).detail?.unit as TemperatureUnit) ?? currentUnit()));
  form.addEventListener('change', () => void run());
  form.addEventListener('submit', (e) => {
    e.preventDefault();
    void run();
  });
  try {
    const place = placeFromQuery(location.search, ctx);
    if (place) setPlace(form, place);
    void run();
  } catch (e) {
    showError(e);
    app.dataset.run = String(++runs);
  }
}
