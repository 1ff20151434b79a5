/**
 * The screening limits of the atlas's workload classes, from the same code the pipeline uses
 * (pipeline/work/limit-curves.ts `limitWbgt`: NIOSH 2016 REL/RAL curves or the ISO 7243:1989
 * table, docs/methods.md §8.2–§8.3) with the manifest's limit model, air movement and clothing
 * adjustment value (CAV, docs/methods.md §8.4). An hour is above the limit when `WBGT + CAV > L(M)`
 * (pipeline/work/README.md), i.e. when the WBGT is above `L(M) − CAV`. Pure.
 */
import type { AtlasManifest } from '../../data/atlas-manifest.ts';
import { limitWbgt, type Acclimatization, type LimitModelId } from '../../../pipeline/work/limit-curves.ts';

export interface ClassLimit {
  workloadClass: string;
  className: string;
  /** [W] */
  metabolicRate: number;
  acclimatization: string;
  /** Limit at the class's work rate [°C-WBGT]. */
  limit: number;
  /** Clothing adjustment value added to the WBGT [°C-WBGT]. */
  clothingAdjustment: number;
  /** The WBGT above which an hour is above the limit: limit − clothing adjustment [°C]. */
  threshold: number;
}

/** Limits of every class × acclimatization state of the atlas (classes in the atlas's order). */
export function classLimits(manifest: AtlasManifest): ClassLimit[] {
  const w = manifest.work;
  const out: ClassLimit[] = [];
  for (const c of w.classes) {
    for (const a of w.acclimatization) {
      const limit = limitWbgt(c.metabolicRate, { model: w.limitModel as LimitModelId, acclimatization: a as Acclimatization, airMovement: w.airMovement });
      out.push({
        workloadClass: c.id,
        className: c.name,
        metabolicRate: c.metabolicRate,
        acclimatization: a,
        limit,
        clothingAdjustment: w.clothingAdjustment,
        threshold: limit - w.clothingAdjustment,
      });
    }
  }
  return out;
}

/** Whether a WBGT [°C] is above a class limit: `WBGT + CAV > L`, strictly, as the pipeline counts hours. */
export function isAbove(wbgt: number, l: ClassLimit): boolean {
  return Number.isFinite(wbgt) && wbgt + l.clothingAdjustment > l.limit;
}
