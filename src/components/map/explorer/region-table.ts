/**
 * The table behind the map: the shown layer's value for each region (the area-weighted mean
 * over its cells, from the region tables; for the niche layer the class of its mean annual
 * temperature). Rows are rendered at build time for the default view; this rewrites the
 * caption, the value column's heading and the values for the current view (fetched per layer,
 * map/values/<n>.json). DOM only.
 */
import type { TemperatureUnit } from '../../../lib/units.ts';
import type { ExplorerCatalogue, ExplorerLayer } from './catalogue.ts';
import { describeLayerLine } from './describe-view.ts';
import { formatLayerValue, unitLabel } from './value-format.ts';

/** `values`: the layer's value per region, in the order of the catalogue's regions (its `values` file); each row names its place in that order (`data-region-index`). */
export function updateRegionTable(
  table: HTMLTableElement,
  catalogue: ExplorerCatalogue,
  layer: ExplorerLayer,
  unit: TemperatureUnit,
  values: ReadonlyArray<number | null>,
): void {
  const legend = catalogue.legends[layer.legend];
  const caption = table.querySelector('caption');
  if (caption)
    caption.textContent = `${describeLayerLine(catalogue, layer)}: value for each region (area-weighted mean over its grid cells${catalogue.invented ? '; invented data' : ''}).`;
  const head = table.querySelector<HTMLElement>('th[data-key="value"]');
  const u = unitLabel(layer.units, unit);
  if (head) head.textContent = legend.kind === 'categorical' ? 'Class' : `Value${u ? ` [${u}]` : ''}`;
  table.dataset.layerId = layer.id;
  for (const tr of table.querySelectorAll<HTMLTableRowElement>('tbody tr[data-region-index]')) {
    const r = Number(tr.dataset.regionIndex ?? -1);
    const td = tr.querySelector<HTMLElement>('td[data-key="value"]');
    if (!td) continue;
    const v = r >= 0 ? values[r] : null;
    td.textContent = formatLayerValue(v, layer.units, unit, legend);
    td.dataset.value = v === null || v === undefined ? '' : String(v);
  }
}
