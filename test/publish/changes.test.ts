import { describe, expect, it } from 'vitest';
import { compareBuilds, tablesInMemory, type BuildFacts } from '../../pipeline/publish/changes.ts';

const HEAD = 'region_id,period,figure,workload_class,acclimatization,exposure,method,statistic,value,unit,years_used,baseline';
const csv = (rows: string[]) => [HEAD, ...rows].join('\n') + '\n';

function facts(over: Partial<BuildFacts>): BuildFacts {
  return {
    buildTime: '2026-01-01T00:00:00Z',
    codeVersion: '0.1.0',
    configDigest: 'a',
    years: [2020, 2023],
    baseline: [2020, 2023],
    inputs: [
      { name: 'a.nc', sha256: '1' },
      { name: 'b.nc', sha256: '2' },
    ],
    regionTables: tablesInMemory(new Map()),
    regionNames: new Map([['r1', 'Region one']]),
    ...over,
  };
}

describe('what changed since the previous build', () => {
  it('lists years and inputs added, changed and removed, and the annual figures that moved most, largest first, per unit', () => {
    const before = facts({
      regionTables: tablesInMemory(
        new Map([
          [
            'r1',
            csv([
              'r1,year,hours-lost-shift,high,acclimatized,sun,limit,mean,100,h,4,2020-2023',
              'r1,year,hours-lost-shift,low,acclimatized,sun,limit,mean,10,h,4,2020-2023',
              'r1,year,wbgt-mean,,,sun,,latest,25.5,degC,1,2020-2023',
              'r1,07,hours-lost-shift,high,acclimatized,sun,limit,mean,50,h,4,2020-2023',
              'r1,year,hours-lost-shift,high,acclimatized,sun,limit,min,1,h,4,2020-2023',
            ]),
          ],
        ]),
      ),
    });
    const after = facts({
      years: [2020, 2024],
      codeVersion: '0.2.0',
      inputs: [
        { name: 'a.nc', sha256: '1' },
        { name: 'b.nc', sha256: '3' },
        { name: 'c.nc', sha256: '4' },
      ],
      regionTables: tablesInMemory(
        new Map([
          [
            'r1',
            csv([
              'r1,year,hours-lost-shift,high,acclimatized,sun,limit,mean,112.5,h,5,2020-2023',
              'r1,year,hours-lost-shift,low,acclimatized,sun,limit,mean,11,h,5,2020-2023',
              'r1,year,wbgt-mean,,,sun,,latest,26,degC,1,2020-2023',
              'r1,07,hours-lost-shift,high,acclimatized,sun,limit,mean,80,h,5,2020-2023',
              'r1,year,hours-lost-shift,high,acclimatized,sun,limit,min,9,h,5,2020-2023',
            ]),
          ],
          ['r2', csv([])],
        ]),
      ),
    });
    const c = compareBuilds(before, after);
    expect(c.hasPrevious).toBe(true);
    expect(c.yearsAdded).toEqual([2024]);
    expect(c.yearsRemoved).toEqual([]);
    expect(c.inputs).toEqual({ added: ['c.nc'], changed: ['b.nc'], removed: [] });
    expect(c.codeChanged).toBe(true);
    expect(c.configChanged).toBe(false);
    expect(c.regionsAdded).toEqual(['r2']);
    // Monthly rows and the min statistic are not compared; °C and h are ranked apart.
    expect(c.moves.map((m) => [m.unit, m.workloadClass, m.change])).toEqual([
      ['degC', '', 0.5],
      ['h', 'high', 12.5],
      ['h', 'low', 1],
    ]);
    expect(c.moves[1]).toMatchObject({ regionName: 'Region one', before: 100, after: 112.5, statistic: 'mean' });
    // The normals a bid uses lead: annual mean and P90 of hours lost and above the limit only.
    expect(c.normals).toMatchObject({ compared: 2, moved: 2, largest: 12.5 });
    expect(c.normals.moves.map((m) => [m.workloadClass, m.change])).toEqual([
      ['high', 12.5],
      ['low', 1],
    ]);
    expect(c.latest).toEqual([]);
  });

  it('tells the normals from the latest year: a new latest year moves only the latest rows, and an unchanged baseline says no normal moved', () => {
    const rows = (mean: number, p90: number, latest: number) =>
      csv([
        `r1,year,hours-lost-shift,high,acclimatized,sun,limit,mean,${mean},h,4,2020-2023`,
        `r1,year,hours-lost-shift,high,acclimatized,sun,limit,p90,${p90},h,4,2020-2023`,
        `r1,year,hours-above-limit-shift,high,acclimatized,sun,limit,mean,${mean * 2},h,4,2020-2023`,
        `r1,year,hours-lost-shift,high,acclimatized,sun,limit,latest,${latest},h,1,2024`,
        `r1,year,hours-above-limit-all,high,acclimatized,sun,limit,mean,${mean * 3},h,4,2020-2023`,
      ]);
    const c = compareBuilds(
      facts({ years: [2020, 2023], regionTables: tablesInMemory(new Map([['r1', rows(100, 130, 90)]])) }),
      facts({ years: [2020, 2024], regionTables: tablesInMemory(new Map([['r1', rows(100, 130, 141.5)]])) }),
    );
    expect(c.baselineChanged).toBe(false);
    expect(c.normals).toEqual({ compared: 3, moved: 0, largest: 0, moves: [] });
    expect(c.latest.map((m) => [m.figure, m.statistic, m.before, m.after, m.change])).toEqual([['hours-lost-shift', 'latest', 90, 141.5, 51.5]]);
    // A figure a bid does not use (day-and-night hours) is no normal of the comparison.
    const moved = compareBuilds(
      facts({ regionTables: tablesInMemory(new Map([['r1', rows(100, 130, 90)]])) }),
      facts({ regionTables: tablesInMemory(new Map([['r1', rows(101, 129, 90)]])) }),
    );
    expect(moved.normals.moved).toBe(3);
    expect(moved.normals.moves.map((m) => [m.figure, m.statistic, m.change])).toEqual([
      ['hours-above-limit-shift', 'mean', 2],
      ['hours-lost-shift', 'mean', 1],
      ['hours-lost-shift', 'p90', -1],
    ]);
  });

  it('says there is no previous build for a first build', () => {
    expect(compareBuilds(null, facts({})).hasPrevious).toBe(false);
  });
});
