import { describe, expect, it } from 'vitest';
import { parseWorkforceShares, DEFAULT_ACCLIMATIZED_SHARE, DEFAULT_SUN_SHARE, type ShareEvaluation } from '../../pipeline/regions/workforce-shares.ts';
import { splitCsvRecord } from '../../pipeline/formats/csv.ts';
import { expectCatalogued } from './helpers.ts';

/** The atlas's evaluations: 2 classes × both acclimatization states × sun and shade, in the nesting order of work-settings.ts. */
const EVALS: ShareEvaluation[] = ['heavy', 'moderate'].flatMap((c) =>
  (['acclimatized', 'unacclimatized'] as const).flatMap((a) => (['sun', 'shade'] as const).map((x) => ({ workloadClass: c, acclimatization: a, exposure: x }))),
);
const REGIONS = ['north', 'south', 'east'];

/** Records as readCsvRecords yields them (line numbers from 1). */
function records(text: string): Array<[number, string[]]> {
  return text
    .trim()
    .split('\n')
    .map((l, i) => [i + 1, splitCsvRecord(l)!]);
}
const parse = (text: string, evals = EVALS) => parseWorkforceShares(records(text), 'shares.csv', REGIONS, evals);

describe('the workforce shares table', () => {
  it('a region with rows of its own uses them alone; the others take the default rows; classes not named have share 0', () => {
    const s = parse(`region_id,workload_class,share
*,heavy,0.05
*,moderate,0.1
south,heavy,0.2`);
    expect(s.regions[0].source).toBe('*');
    expect(s.regions[2].source).toBe('*');
    expect(s.regions[1].source).toBe('south');
    expect(s.regions[1].classes.map((c) => c.share)).toEqual([0.2, 0]);
    expect(s.regions[0].total).toBeCloseTo(0.15, 15);
    expect(s.fallback?.source).toBe('*');
  });

  it('without acclimatization and exposure shares the stated defaults apply: every outdoor worker acclimatized, in the sun', () => {
    expect(DEFAULT_ACCLIMATIZED_SHARE).toBe(1);
    expect(DEFAULT_SUN_SHARE).toBe(1);
    const s = parse('region_id,workload_class,share\n*,heavy,0.05\n*,moderate,0.1');
    // heavy.acclimatized.sun carries heavy's whole share; the other three heavy evaluations nothing.
    expect(Array.from(s.regions[0].evalWeights)).toEqual([0.05, 0, 0, 0, 0.1, 0, 0, 0]);
  });

  it('weights mix acclimatization and exposure as the shares say (by hand: 0.2 × 0.7 × 0.6 = 0.084 acclimatized in the sun)', () => {
    const s = parse('region_id,workload_class,share,acclimatized_share,sun_share\nnorth,heavy,0.2,0.7,0.6\n*,moderate,0.1,,0.5');
    const w = Array.from(s.regions[0].classEvalWeights[0]);
    expect(w[0]).toBeCloseTo(0.084, 15); // acclimatized, sun
    expect(w[1]).toBeCloseTo(0.056, 15); // acclimatized, shade: 0.2 × 0.7 × 0.4
    expect(w[2]).toBeCloseTo(0.036, 15); // unacclimatized, sun: 0.2 × 0.3 × 0.6
    expect(w[3]).toBeCloseTo(0.024, 15); // unacclimatized, shade: 0.2 × 0.3 × 0.4
    expect(w.slice(4)).toEqual([0, 0, 0, 0]);
    expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(0.2, 15);
    // The default rows: moderate, acclimatized (default 1), half in the sun.
    expect(Array.from(s.regions[1].evalWeights).slice(4)).toEqual([0.05, 0.05, 0, 0]);
  });
});

describe('bad shares tables are catalogued errors naming the file and line', () => {
  it('shares adding up to more than 1 for a region', () => {
    expectCatalogued(
      () => parse('region_id,workload_class,share\nnorth,heavy,0.7\nnorth,moderate,0.4\n*,heavy,0.1'),
      'WorkforceSharesSum',
      /"north".*1\.1000.*lines 2, 3/,
    );
    expectCatalogued(() => parse('region_id,workload_class,share\n*,heavy,0.7\n*,moderate,0.31'), 'WorkforceSharesSum', /\* \(the default\)/);
  });

  it('a share that is not a number from 0 to 1, or is empty', () => {
    expectCatalogued(() => parse('region_id,workload_class,share\n*,heavy,12%'), 'WorkforceSharesBadValue', /line 2: share "12%" is not a number/);
    expectCatalogued(() => parse('region_id,workload_class,share\n*,heavy,1.5'), 'WorkforceSharesBadValue', /outside 0 … 1/);
    expectCatalogued(() => parse('region_id,workload_class,share\n*,heavy,-0.1'), 'WorkforceSharesBadValue', /outside 0 … 1/);
    expectCatalogued(() => parse('region_id,workload_class,share\n*,heavy,'), 'WorkforceSharesBadValue', /is empty/);
    expectCatalogued(() => parse('region_id,workload_class,share,sun_share\n*,heavy,0.1,0,5'), 'WorkforceSharesColumns', /line 2 has 5 field/);
    expectCatalogued(() => parse('region_id,workload_class,share,sun_share\n*,heavy,0.1,1.2'), 'WorkforceSharesBadValue', /sun_share "1.2"/);
  });

  it('missing, unknown or repeated columns', () => {
    expectCatalogued(
      () => parse('region,workload_class,share\n*,heavy,0.1'),
      'WorkforceSharesColumns',
      /missing column\(s\) region_id.*unknown column\(s\) "region"/,
    );
    expectCatalogued(() => parse('region_id,workload_class,share,sun_shares\n*,heavy,0.1,1'), 'WorkforceSharesColumns', /"sun_shares"/);
    expectCatalogued(() => parseWorkforceShares([], 'shares.csv', REGIONS, EVALS), 'WorkforceSharesColumns', /empty/);
    expectCatalogued(() => parse('region_id,workload_class,share'), 'WorkforceSharesEmpty');
  });

  it('a region or class the atlas does not have, and a row given twice', () => {
    expectCatalogued(() => parse('region_id,workload_class,share\nwest,heavy,0.1'), 'WorkforceSharesRegionUnknown', /"west".*north, south, east/);
    expectCatalogued(() => parse('region_id,workload_class,share\n*,very-heavy,0.1'), 'WorkforceSharesClassUnknown', /"very-heavy".*heavy, moderate/);
    expectCatalogued(() => parse('region_id,workload_class,share\n*,heavy,0.1\n*,heavy,0.2'), 'WorkforceSharesDuplicate', /line 3.*line 2/);
  });

  it('a region without rows when there is no default', () => {
    expectCatalogued(() => parse('region_id,workload_class,share\nnorth,heavy,0.1\nsouth,heavy,0.1'), 'WorkforceSharesMissing', /"east"/);
  });

  it('shares that put workers in an acclimatization state or exposure the atlas does not evaluate', () => {
    const sunOnly = EVALS.filter((e) => e.exposure === 'sun');
    expectCatalogued(
      () => parse('region_id,workload_class,share,sun_share\n*,heavy,0.1,0.5', sunOnly),
      'WorkforceSharesEvaluation',
      /heavy work, acclimatized, in the shade/,
    );
    // All in the sun: the shade evaluation is not needed.
    expect(parse('region_id,workload_class,share\n*,heavy,0.1', sunOnly).regions[0].total).toBe(0.1);
  });
});
