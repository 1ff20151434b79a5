/**
 * What changed since the previous build (`data/changes.json`), so a team sees the effect of the
 * yearly update: first what moved in the normals a bid uses (annual shift hours lost and hours
 * above the limit, baseline mean and P90, per region, workload class, acclimatization and
 * exposure) and whether the baseline is the same; then the latest year, whose change is
 * year-to-year weather; then years and input files added, changed or removed, code and
 * configuration changes. Pure: the previous and the new build's manifest facts and region tables
 * in, the comparison out. Compares the region CSVs as published (pipeline/publish/region-table.ts),
 * one region at a time (the tables are read through `regionTables.get`, so a build with many
 * regions never holds them all), keeping only the largest moves of each list.
 */
import { REGION_TABLE_COLUMNS } from './region-table.ts';

/** Region tables by id, read one at a time. */
export interface RegionTables {
  ids(): Iterable<string>;
  /** The region's published CSV text, or undefined when the build has no such region. */
  get(id: string): string | undefined;
  has(id: string): boolean;
}

/** Region tables held in memory (tests, small builds). */
export function tablesInMemory(m: Map<string, string>): RegionTables {
  return { ids: () => m.keys(), get: (id) => m.get(id), has: (id) => m.has(id) };
}

/** The facts of one build the comparison needs. */
export interface BuildFacts {
  buildTime: string;
  codeVersion: string;
  configDigest: string;
  years: [number, number];
  baseline: [number, number];
  inputs: Array<{ name: string; sha256: string }>;
  /** Region id → its published CSV text. */
  regionTables: RegionTables;
  /** Region id → name. */
  regionNames: Map<string, string>;
}

/** One figure's move between the builds. */
export interface FigureMove {
  regionId: string;
  regionName: string;
  figure: string;
  workloadClass: string;
  acclimatization: string;
  exposure: string;
  method: string;
  /** `mean` (baseline normal), `p90`, or `latest` (the latest year). */
  statistic: string;
  before: number;
  after: number;
  /** after − before [unit]. */
  change: number;
  unit: string;
}

/** The figures a bid uses, whose normals lead the comparison. */
export const BID_FIGURES: readonly string[] = ['hours-lost-shift', 'hours-above-limit-shift'];
/** The normals of those figures that are compared (the latest year is weather, not a normal). */
export const NORMAL_STATISTICS: readonly string[] = ['mean', 'p90'];

/** How the normals a bid uses moved. */
export interface NormalsChange {
  /** Annual normals of {@link BID_FIGURES} present in both builds [count]. */
  compared: number;
  /** Of those, how many changed [count]. */
  moved: number;
  /** Largest |change| among them [h]; 0 when none moved. */
  largest: number;
  /** The largest moves, largest |change| first (at most `limit`). */
  moves: FigureMove[];
}

export interface BuildChanges {
  version: 2;
  /** false for a first build (nothing to compare with); the rest is then empty. */
  hasPrevious: boolean;
  previous?: { buildTime: string; codeVersion: string; years: [number, number]; baseline: [number, number] };
  yearsAdded: number[];
  yearsRemoved: number[];
  baselineChanged: boolean;
  inputs: { added: string[]; changed: string[]; removed: string[] };
  codeChanged: boolean;
  configChanged: boolean;
  /** The normals a bid uses: lead the page. */
  normals: NormalsChange;
  /** The latest year's annual values of {@link BID_FIGURES} that moved most (year-to-year weather when the latest year changed). */
  latest: FigureMove[];
  /** The largest annual moves of every figure and statistic compared, per unit, largest |change| first (at most `limit` per unit). */
  moves: FigureMove[];
  regionsAdded: string[];
  regionsRemoved: string[];
}

/** Statistics compared (annual rows only). */
const COMPARED_STATISTICS = new Set(['mean', 'p90', 'latest']);

const years = (r: [number, number]) => Array.from({ length: r[1] - r[0] + 1 }, (_, i) => r[0] + i);

/** Annual rows of a region CSV, keyed by figure|class|acclimatization|exposure|method|statistic. */
function annualRows(csv: string): Map<string, { value: number; unit: string; cols: string[] }> {
  const out = new Map<string, { value: number; unit: string; cols: string[] }>();
  const lines = csv.trim().split('\n');
  const head = lines[0].split(',');
  const at = (name: string) => head.indexOf(name);
  // period, figure, workload_class, acclimatization, exposure, method, statistic, value, unit
  const [iP, iF, iC, iA, iE, iM, iS, iV, iU] = REGION_TABLE_COLUMNS.slice(1, 10).map(at);
  for (const line of lines.slice(1)) {
    if (!line.includes(',year,')) continue; // annual rows only (cheap test before splitting)
    const c = line.split(',');
    if (c[iP] !== 'year' || !COMPARED_STATISTICS.has(c[iS]) || c[iV] === '') continue;
    const cols = [c[iF], c[iC], c[iA], c[iE], c[iM], c[iS]];
    out.set(cols.join('|'), { value: Number(c[iV]), unit: c[iU], cols });
  }
  return out;
}

const isBidNormal = (figure: string, statistic: string) => BID_FIGURES.includes(figure) && NORMAL_STATISTICS.includes(statistic);

/** Compares the new build with the previous one (null for a first build). */
export function compareBuilds(prev: BuildFacts | null, next: BuildFacts, limit = 10): BuildChanges {
  const empty: BuildChanges = {
    version: 2,
    hasPrevious: false,
    yearsAdded: [],
    yearsRemoved: [],
    baselineChanged: false,
    inputs: { added: [], changed: [], removed: [] },
    codeChanged: false,
    configChanged: false,
    normals: { compared: 0, moved: 0, largest: 0, moves: [] },
    latest: [],
    moves: [],
    regionsAdded: [],
    regionsRemoved: [],
  };
  if (!prev) return empty;
  const py = new Set(years(prev.years));
  const ny = new Set(years(next.years));
  const pin = new Map(prev.inputs.map((f) => [f.name, f.sha256]));
  const nin = new Map(next.inputs.map((f) => [f.name, f.sha256]));
  const order = (x: FigureMove, y: FigureMove) =>
    Math.abs(y.change) - Math.abs(x.change) ||
    (x.regionId + x.figure + x.workloadClass + x.statistic < y.regionId + y.figure + y.workloadClass + y.statistic ? -1 : 1);
  // Only the largest moves of each list are kept: a list is cut back to `limit` whenever it doubles.
  const keeper = () => {
    const list: FigureMove[] = [];
    return {
      list,
      add(m: FigureMove) {
        list.push(m);
        if (list.length >= 2 * limit + 64) list.sort(order).length = limit;
      },
      top: () => list.sort(order).slice(0, limit),
    };
  };
  const byUnit = new Map<string, ReturnType<typeof keeper>>();
  const normals = keeper();
  const latest = keeper();
  let normalsCompared = 0;
  let normalsMoved = 0;
  let normalsLargest = 0;
  const keep = (m: FigureMove) => {
    let k = byUnit.get(m.unit);
    if (!k) byUnit.set(m.unit, (k = keeper()));
    k.add(m);
    if (isBidNormal(m.figure, m.statistic)) {
      normalsMoved += 1;
      normalsLargest = Math.max(normalsLargest, Math.abs(m.change));
      normals.add(m);
    } else if (BID_FIGURES.includes(m.figure) && m.statistic === 'latest') latest.add(m);
  };
  for (const id of next.regionTables.ids()) {
    const before = prev.regionTables.get(id);
    if (before === undefined) continue;
    const csv = next.regionTables.get(id)!;
    const a = annualRows(before);
    for (const [key, row] of annualRows(csv)) {
      const old = a.get(key);
      if (!old || old.unit !== row.unit || !Number.isFinite(old.value) || !Number.isFinite(row.value)) continue;
      const [figure, workloadClass, acclimatization, exposure, method, statistic] = row.cols;
      if (isBidNormal(figure, statistic)) normalsCompared += 1;
      if (old.value === row.value) continue;
      keep({
        regionId: id,
        regionName: next.regionNames.get(id) ?? id,
        figure,
        workloadClass,
        acclimatization,
        exposure,
        method,
        statistic,
        before: old.value,
        after: row.value,
        change: Math.round((row.value - old.value) * 1e6) / 1e6,
        unit: row.unit,
      });
    }
  }
  const top = [...byUnit.keys()].sort().flatMap((u) => byUnit.get(u)!.top());
  return {
    version: 2,
    hasPrevious: true,
    previous: { buildTime: prev.buildTime, codeVersion: prev.codeVersion, years: prev.years, baseline: prev.baseline },
    yearsAdded: [...ny].filter((y) => !py.has(y)),
    yearsRemoved: [...py].filter((y) => !ny.has(y)),
    baselineChanged: prev.baseline[0] !== next.baseline[0] || prev.baseline[1] !== next.baseline[1],
    inputs: {
      added: [...nin.keys()].filter((n) => !pin.has(n)).sort(),
      changed: [...nin.keys()].filter((n) => pin.has(n) && pin.get(n) !== nin.get(n)).sort(),
      removed: [...pin.keys()].filter((n) => !nin.has(n)).sort(),
    },
    codeChanged: prev.codeVersion !== next.codeVersion,
    configChanged: prev.configDigest !== next.configDigest,
    normals: { compared: normalsCompared, moved: normalsMoved, largest: normalsLargest, moves: normals.top() },
    latest: latest.top(),
    moves: top,
    regionsAdded: [...next.regionTables.ids()].filter((id) => !prev.regionTables.has(id)).sort(),
    regionsRemoved: [...prev.regionTables.ids()].filter((id) => !next.regionTables.has(id)).sort(),
  };
}
