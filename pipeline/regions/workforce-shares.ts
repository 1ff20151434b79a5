/**
 * The workforce shares table (CSV, `workforce.shares` of atlas.yaml): per region and workload
 * class, the share of the people who do outdoor work of that class, and of those workers the
 * share who are acclimatized and the share who work in the sun.
 *
 *   region_id,workload_class,share,acclimatized_share,sun_share
 *   *,heavy,0.04,,
 *   sollent-coast,heavy,0.06,0.8,0.9
 *
 * `region_id` `*` is the default: a region with rows of its own uses those rows only, every other
 * region the default rows. A class a region's rows do not name has share 0. Empty
 * `acclimatized_share` or `sun_share` (or no such column) take the stated defaults
 * {@link DEFAULT_ACCLIMATIZED_SHARE} and {@link DEFAULT_SUN_SHARE}. A region's shares must add up
 * to 1 or less (each person is counted in one class at most).
 *
 * From the table each region gets a profile: per evaluation (class × acclimatization × exposure)
 * the weight share × (a or 1 − a) × (s or 1 − s), so that hours per outdoor worker mix the
 * atlas's evaluations as the shares say. The table splits the workers between the sun and the
 * shade only: an evaluation under a shelter (the opt-in exposure) has weight 0. Pure: parsed records in, profiles out; every problem is a
 * catalogued error naming the file and line.
 */
import {
  WorkforceSharesBadValue,
  WorkforceSharesClassUnknown,
  WorkforceSharesColumns,
  WorkforceSharesDuplicate,
  WorkforceSharesEmpty,
  WorkforceSharesEvaluation,
  WorkforceSharesMissing,
  WorkforceSharesRegionUnknown,
  WorkforceSharesSum,
} from './errors.ts';

/**
 * Share of the outdoor workers who are acclimatized, when the table does not say [1]: 1, a settled
 * workforce that works outdoors every day of the hot season (our stated default; new and
 * returning workers are not acclimatized, so give a lower share where they are many).
 */
export const DEFAULT_ACCLIMATIZED_SHARE = 1;
/**
 * Share of the outdoor workers who work in the sun, when the table does not say [1]: 1, outdoor
 * work in the open (our stated default; the shade evaluation is the open sky with the sun removed).
 */
export const DEFAULT_SUN_SHARE = 1;
/** The region id of the default rows. */
export const DEFAULT_REGION = '*';
/** Shares may exceed 1 by this much before they count as too large (rounding in a table) [1]. */
const SUM_TOLERANCE = 1e-9;

const REQUIRED = ['region_id', 'workload_class', 'share'] as const;
const OPTIONAL = ['acclimatized_share', 'sun_share'] as const;

/** One class of a profile. */
export interface ClassShare {
  workloadClass: string;
  /** Share of all people who do outdoor work of this class [1]. */
  share: number;
  /** Of those, the share acclimatized and the share in the sun [1]. */
  acclimatized: number;
  sun: number;
}

/** The evaluations as the shares need them: key parts in the atlas's evaluation order. */
export interface ShareEvaluation {
  workloadClass: string;
  acclimatization: 'acclimatized' | 'unacclimatized';
  /** `shelter` evaluations get no people: the table splits the workers between sun and shade only. */
  exposure: 'sun' | 'shade' | 'shelter';
}

/** What one region (or the default) uses. */
export interface ShareProfile {
  /** The region id whose rows these are, or `*`. */
  source: string;
  /** Every evaluated class, in the atlas's class order (share 0 where no row names it). */
  classes: ClassShare[];
  /** Σ share [1]. */
  total: number;
  /** Per evaluation: share · acclimatization share · exposure share [1]; Σ = total. */
  evalWeights: Float64Array;
  /** Per class (order of `classes`), per evaluation: that class's part of evalWeights [1]. */
  classEvalWeights: Float64Array[];
}

export interface WorkforceShares {
  /** The profile of each region, in the order of the ids given. */
  regions: ShareProfile[];
  /** The default profile (rows `*`), for cells outside every region; undefined without one. */
  fallback?: ShareProfile;
}

interface Row {
  line: number;
  region: string;
  workloadClass: string;
  share: number;
  acclimatized: number;
  sun: number;
}

/**
 * Checks the table and makes the profiles.
 * @param records the CSV's records as [line number, fields], the header first
 * @param file the table's path, for messages
 * @param regionIds the atlas's regions, in build order
 * @param evaluations the atlas's evaluations, in order
 */
export function parseWorkforceShares(
  records: ReadonlyArray<readonly [number, readonly string[]]>,
  file: string,
  regionIds: readonly string[],
  evaluations: readonly ShareEvaluation[],
): WorkforceShares {
  if (records.length === 0) throw WorkforceSharesColumns({ file, detail: 'the file is empty (no header)' }, { file });
  const header = records[0][1].map((h) => h.trim().replace(/^\uFEFF/, ''));
  const missing = REQUIRED.filter((c) => !header.includes(c));
  const unknown = header.filter((c) => !(REQUIRED as readonly string[]).includes(c) && !(OPTIONAL as readonly string[]).includes(c));
  const repeated = header.filter((c, i) => header.indexOf(c) !== i);
  if (missing.length > 0 || unknown.length > 0 || repeated.length > 0) {
    const parts = [
      ...(missing.length ? [`missing column(s) ${missing.join(', ')}`] : []),
      ...(unknown.length ? [`unknown column(s) ${unknown.map((c) => `"${c}"`).join(', ')}`] : []),
      ...(repeated.length ? [`repeated column(s) ${repeated.join(', ')}`] : []),
    ];
    throw WorkforceSharesColumns({ file, detail: parts.join('; ') }, { file, row: records[0][0] });
  }
  const col = (name: string) => header.indexOf(name);
  const classIds = [...new Set(evaluations.map((e) => e.workloadClass))];
  const known = new Set(regionIds);
  const rows: Row[] = [];
  const seen = new Map<string, number>();
  for (const [line, fields] of records.slice(1)) {
    if (fields.length === 1 && fields[0].trim() === '') continue;
    const cell = (name: string) => (col(name) >= 0 ? (fields[col(name)] ?? '').trim() : '');
    if (fields.length !== header.length) {
      throw WorkforceSharesColumns({ file, detail: `line ${line} has ${fields.length} field(s) but the header has ${header.length}` }, { file, row: line });
    }
    const region = cell('region_id');
    const workloadClass = cell('workload_class');
    if (region !== DEFAULT_REGION && !known.has(region)) {
      throw WorkforceSharesRegionUnknown({ file, row: line, region, known: listSome(regionIds) }, { file, row: line });
    }
    if (!classIds.includes(workloadClass))
      throw WorkforceSharesClassUnknown({ file, row: line, workloadClass, known: classIds.join(', ') }, { file, row: line });
    const key = `${region}\0${workloadClass}`;
    const first = seen.get(key);
    if (first !== undefined) throw WorkforceSharesDuplicate({ file, row: line, first, region, workloadClass }, { file, row: line });
    seen.set(key, line);
    rows.push({
      line,
      region,
      workloadClass,
      share: shareValue(cell('share'), 'share', undefined, file, line),
      acclimatized: shareValue(cell('acclimatized_share'), 'acclimatized_share', DEFAULT_ACCLIMATIZED_SHARE, file, line),
      sun: shareValue(cell('sun_share'), 'sun_share', DEFAULT_SUN_SHARE, file, line),
    });
  }
  if (rows.length === 0) throw WorkforceSharesEmpty({ file }, { file });

  const profileOf = (source: string): ShareProfile | undefined => {
    const mine = rows.filter((r) => r.region === source);
    if (mine.length === 0) return undefined;
    const total = mine.reduce((s, r) => s + r.share, 0);
    if (total > 1 + SUM_TOLERANCE) {
      throw WorkforceSharesSum(
        { file, region: source === DEFAULT_REGION ? '* (the default)' : `"${source}"`, sum: total, rows: mine.map((r) => r.line).join(', ') },
        { file, row: mine[0].line },
      );
    }
    const classes = classIds.map((id) => {
      const r = mine.find((x) => x.workloadClass === id);
      return { workloadClass: id, share: r?.share ?? 0, acclimatized: r?.acclimatized ?? DEFAULT_ACCLIMATIZED_SHARE, sun: r?.sun ?? DEFAULT_SUN_SHARE };
    });
    const classEvalWeights = classes.map((c) => {
      const w = new Float64Array(evaluations.length);
      evaluations.forEach((e, i) => {
        if (e.workloadClass !== c.workloadClass) return;
        w[i] =
          c.share *
          (e.acclimatization === 'acclimatized' ? c.acclimatized : 1 - c.acclimatized) *
          (e.exposure === 'sun' ? c.sun : e.exposure === 'shade' ? 1 - c.sun : 0);
      });
      return w;
    });
    // Every mix of acclimatization and exposure with workers in it must be evaluated.
    for (const c of classes) {
      if (!(c.share > 0)) continue;
      const line = mine.find((x) => x.workloadClass === c.workloadClass)!.line;
      for (const acc of ['acclimatized', 'unacclimatized'] as const) {
        for (const exp of ['sun', 'shade'] as const) {
          const w = (acc === 'acclimatized' ? c.acclimatized : 1 - c.acclimatized) * (exp === 'sun' ? c.sun : 1 - c.sun);
          if (!(w > 0)) continue;
          if (evaluations.some((e) => e.workloadClass === c.workloadClass && e.acclimatization === acc && e.exposure === exp)) continue;
          const evaluated = [
            ...new Set(evaluations.filter((e) => e.workloadClass === c.workloadClass).map((e) => `${e.acclimatization} in the ${e.exposure}`)),
          ].join(', ');
          throw WorkforceSharesEvaluation({ file, row: line, needs: `${c.workloadClass} work, ${acc}, in the ${exp}`, evaluated }, { file, row: line });
        }
      }
    }
    const evalWeights = new Float64Array(evaluations.length);
    for (const w of classEvalWeights) for (let i = 0; i < w.length; i++) evalWeights[i] += w[i];
    return { source, classes, total, evalWeights, classEvalWeights };
  };

  const fallback = profileOf(DEFAULT_REGION);
  const regions = regionIds.map((id) => {
    const p = profileOf(id) ?? fallback;
    if (!p) throw WorkforceSharesMissing({ file, region: `"${id}"` }, { file });
    return p;
  });
  return { regions, fallback };
}

function shareValue(text: string, column: string, fallback: number | undefined, file: string, line: number): number {
  if (text === '') {
    if (fallback !== undefined) return fallback;
    throw WorkforceSharesBadValue({ file, row: line, column, value: text, detail: 'is empty' }, { file, row: line });
  }
  if (!/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(text)) {
    throw WorkforceSharesBadValue({ file, row: line, column, value: text, detail: 'is not a number' }, { file, row: line });
  }
  const v = Number(text);
  if (!(v >= 0 && v <= 1)) throw WorkforceSharesBadValue({ file, row: line, column, value: text, detail: 'lies outside 0 … 1' }, { file, row: line });
  return v;
}

function listSome(ids: readonly string[]): string {
  return ids.length <= 8 ? ids.join(', ') : `${ids.slice(0, 8).join(', ')} and ${ids.length - 8} more`;
}
