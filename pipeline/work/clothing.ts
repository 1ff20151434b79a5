/**
 * Clothing adjustment values (CAV): added to the WBGT to give the effective WBGT the limits are
 * compared with (ACGIH TLV; Bernard et al. 2008). Each ensemble carries its value [°C-WBGT] and
 * how sure we are of it: `verified` = read in the named source, `from-memory` = not verified
 * against a source (a lead, not a fact); the methods page lists the unverified ones together.
 */
import { ClothingAdjustmentOutOfRange, ClothingEnsembleUnknown } from './errors.ts';
import type { ErrorWhere } from '../model/errors.ts';

/** How a value is known: read in the named source, or from memory (not verified). */
export type SourceTag = 'verified' | 'from-memory';

export interface ClothingEnsemble {
  /** Our id, used in the configuration. */
  id: string;
  /** Plain name. */
  name: string;
  /** Clothing adjustment value [°C-WBGT], added to WBGT. */
  cav: number;
  /** Provenance of the value. */
  sourceTag: SourceTag;
  /** Where the value comes from. */
  source: string;
}

/** The ensembles offered, with their values and sources. */
export const CLOTHING_ENSEMBLES: readonly ClothingEnsemble[] = [
  {
    id: 'work-clothes',
    name: 'Work clothes (long-sleeved shirt and trousers)',
    cav: 0,
    sourceTag: 'verified',
    source:
      'The baseline of the clothing adjustments: Bernard et al. 2008, J. Occup. Environ. Hyg. 5(1):1–5 (factors measured against cotton work clothes); a NIOSH health hazard evaluation: cotton work uniforms need no adjustment (citing ACGIH 2014)',
  },
  {
    id: 'woven-coveralls',
    name: 'Woven cloth coveralls',
    cav: 0,
    sourceTag: 'verified',
    source: 'Bernard et al. 2008, J. Occup. Environ. Hyg. 5(1):1–5, abstract (0 for cotton coveralls)',
  },
  {
    id: 'double-layer-woven',
    name: 'Double layer of woven clothing',
    cav: 3,
    sourceTag: 'from-memory',
    source: 'ACGIH TLV (value from memory)',
  },
  {
    id: 'sms-coveralls',
    name: 'SMS polypropylene coveralls',
    cav: 0.5,
    sourceTag: 'from-memory',
    source: 'ACGIH TLV (value from memory)',
  },
  {
    id: 'polyolefin-coveralls',
    name: 'Polyolefin coveralls (flash-spun, limited use)',
    cav: 1,
    sourceTag: 'verified',
    source: 'Bernard et al. 2008, abstract (1.0 for Tyvek 1422A)',
  },
  {
    id: 'microporous-coveralls',
    name: 'Microporous film coveralls',
    cav: 2.5,
    sourceTag: 'verified',
    source: 'Bernard et al. 2008, abstract (2.5 for NexGen microporous coveralls)',
  },
  {
    id: 'vapour-barrier-coveralls',
    name: 'Limited-use vapour-barrier coveralls',
    cav: 11,
    sourceTag: 'from-memory',
    source:
      'ACGIH TLV +11 (value from memory); Bernard et al. 2008 (abstract, read) measured 7.5 for Tychem QC and kept 10 as the recommendation; the larger value is used here. Such ensembles may need physiological monitoring instead of a WBGT screen.',
  },
];

/** Added when a hood is worn with any ensemble [°C-WBGT] (ACGIH TLV, value from memory). */
export const HOOD_CAV = 1;
/** Provenance of {@link HOOD_CAV}. */
export const HOOD_CAV_SOURCE_TAG: SourceTag = 'from-memory';

/** Largest clothing adjustment value accepted [°C-WBGT]. */
export const MAX_CAV = 20;

/** The ensemble with this id; catalogued error ClothingEnsembleUnknown otherwise. */
export function clothingEnsemble(id: string, where: ErrorWhere = {}): ClothingEnsemble {
  const e = CLOTHING_ENSEMBLES.find((x) => x.id === id);
  if (!e) throw ClothingEnsembleUnknown({ id, known: CLOTHING_ENSEMBLES.map((x) => x.id) }, where);
  return e;
}

/** Clothing as configured: a table ensemble (with or without hood), or a value given directly. */
export type ClothingChoice = { ensemble: string; hood?: boolean } | { cav: number };

/**
 * Clothing adjustment value [°C-WBGT] of a choice: the ensemble's CAV (+ {@link HOOD_CAV} with a
 * hood), or the given value. Catalogued errors: ClothingEnsembleUnknown, ClothingAdjustmentOutOfRange
 * (outside 0–20 or not finite).
 */
export function clothingAdjustment(choice: ClothingChoice, where: ErrorWhere = {}): number {
  const value = 'cav' in choice ? choice.cav : clothingEnsemble(choice.ensemble, where).cav + (choice.hood ? HOOD_CAV : 0);
  if (!Number.isFinite(value) || value < 0 || value > MAX_CAV) throw ClothingAdjustmentOutOfRange({ value }, where);
  return value;
}
