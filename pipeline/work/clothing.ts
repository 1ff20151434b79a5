/**
 * Clothing adjustment values (CAV): added to the WBGT to give the effective WBGT the limits are
 * compared with (METHODS.md §5.5). Each ensemble carries its value [°C-WBGT] and how sure we are of
 * it, marked exactly as METHODS.md marks it: `verified` = read in the named source, `from-memory` =
 * not verified against a source (a lead, not a fact).
 */
import { ClothingAdjustmentOutOfRange, ClothingEnsembleUnknown } from './errors.ts';
import type { ErrorWhere } from '../model/errors.ts';

/** How a value is known (METHODS.md provenance tags: [V] = verified, "(from memory)"). */
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

/** The ensembles of METHODS.md §5.5. */
export const CLOTHING_ENSEMBLES: readonly ClothingEnsemble[] = [
  {
    id: 'work-clothes',
    name: 'Work clothes (long-sleeved shirt and trousers)',
    cav: 0,
    sourceTag: 'from-memory',
    source: 'ACGIH ensemble list (list verified, value from memory); METHODS.md §5.5',
  },
  {
    id: 'woven-coveralls',
    name: 'Woven cloth coveralls',
    cav: 0,
    sourceTag: 'verified',
    source: 'Bernard et al. 2008, J. Occup. Environ. Hyg. (measured 0 for cotton coveralls); METHODS.md §5.5',
  },
  {
    id: 'double-layer-woven',
    name: 'Double layer of woven clothing',
    cav: 3,
    sourceTag: 'from-memory',
    source: 'ACGIH (from memory); METHODS.md §5.5',
  },
  {
    id: 'sms-coveralls',
    name: 'SMS polypropylene coveralls',
    cav: 0.5,
    sourceTag: 'from-memory',
    source: 'ACGIH (from memory); METHODS.md §5.5',
  },
  {
    id: 'polyolefin-coveralls',
    name: 'Polyolefin coveralls (flash-spun, limited use)',
    cav: 1,
    sourceTag: 'verified',
    source: 'Bernard et al. 2008 (measured 1.0); ACGIH +1 from memory; METHODS.md §5.5',
  },
  {
    id: 'microporous-coveralls',
    name: 'Microporous film coveralls',
    cav: 2.5,
    sourceTag: 'verified',
    source: 'Bernard et al. 2008; METHODS.md §5.5',
  },
  {
    id: 'vapour-barrier-coveralls',
    name: 'Limited-use vapour-barrier coveralls',
    cav: 11,
    sourceTag: 'from-memory',
    source:
      'ACGIH +11 (from memory); Bernard et al. 2008 [verified] kept 10 as the recommendation for one such garment; the larger value is used here; METHODS.md §5.5. Such ensembles may need physiological monitoring instead of a WBGT screen.',
  },
];

/** Added when a hood is worn with any ensemble [°C-WBGT] (ACGIH, from memory; METHODS.md §5.5). */
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
