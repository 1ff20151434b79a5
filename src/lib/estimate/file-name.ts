/**
 * The file name of a download of the estimate page, e.g.
 * `bid-varn-shore-moderate-acclimatized-sun.csv`: what, where, the work, acclimatization, exposure.
 */
import type { EstimateInputs } from '../../../pipeline/schedule/inputs.ts';
import type { ResolvedPlace } from '../../../pipeline/schedule/place.ts';

/** A file name for a download of `what` (`estimate`, `monthly`, `bid`) with extension `ext`. */
export function estimateFileName(
  r: { inputs: Pick<EstimateInputs, 'classId' | 'workRate' | 'acclimatization' | 'exposure'> },
  place: ResolvedPlace,
  ext = 'csv',
  what = 'estimate',
): string {
  const where = place.kind === 'region' ? place.id : `cell-${place.cell}`;
  const work = r.inputs.classId ?? `${Math.round(r.inputs.workRate)}w`;
  return `${what}-${where}-${work}-${r.inputs.acclimatization}-${r.inputs.exposure}.${ext}`;
}
