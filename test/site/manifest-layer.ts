/**
 * A manifest layer entry of the figure `hours-lost-shift`, view moderate.acclimatized.sun, for
 * hand-written manifests in the site tests (invented paths, for tests only): its id, figure,
 * combination, statistic, period, units [h] and its PNG and GeoTIFF below `root` (`data/` for
 * the record, `data/scenarios/<id>/` for a scenario).
 */
export function manifestLayer(root: string, stat: string, period: string) {
  const base = `${root}layers/hours-lost-shift/moderate.acclimatized.sun/${stat}-${period}`;
  return {
    id: `hours-lost-shift/moderate.acclimatized.sun/${stat}-${period}`,
    figure: 'hours-lost-shift',
    combo: 'moderate.acclimatized.sun',
    statistic: stat,
    period,
    units: 'h',
    png: `${base}.png`,
    tif: `${base}.tif`,
  };
}
