/**
 * The estimate on the atlas's scenarios, on the invented small test atlas with its one scenario
 * (test/site/pipeline-data.ts `withScenario`: a uniform warming of 2 K, invented for the tests):
 * a warmer climate never lets a job finish earlier than the record for the same job (every region,
 * every weather year, every start month); the JSON's `scenarios` entry carries the record's fields
 * and says what the scenario is; the scenario reads its own tiles (data/scenarios/<id>/…); an
 * unknown scenario id is the catalogued EstimateScenarioUnknown, its hint listing the ids, and the
 * command then writes no file; the CSV and the workbook (read back by openpyxl) carry the scenario.
 *
 * Outside check: with every hour 2 K warmer at the same relative humidity, WBGT rises (ISO 7243:
 * WBGT grows with air and natural wet-bulb temperature), so the hours above a fixed limit and the
 * rest breaks can only grow — the direction the test asserts, not a value.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData, PIPELINE_DATA_SCENARIO } from '../site/pipeline-data.ts';
import { formatEstimate, runEstimateCommand, type EstimateOptions } from '../../pipeline/commands/estimate.ts';
import { openEstimateAtlas, type EstimateAtlas } from '../../pipeline/run/estimate-atlas.ts';
import { bidCsv } from '../../pipeline/schedule/bid-csv.ts';
import { bidSheets } from '../../pipeline/schedule/bid-sheets.ts';
import { workbookBytes } from '../../pipeline/publish/workbook.ts';
import { parseScenarios } from '../../pipeline/schedule/inputs.ts';
import { scenarioContext, scenarioPath } from '../../pipeline/schedule/scenario-runs.ts';
import { SCENARIO_CAVEAT } from '../../pipeline/scenario/describe.ts';
import { expectCatalogued, expectCataloguedAsync } from '../helpers/catalogued.ts';
import { PROJECT_ROOT } from '../site/browser.ts';

const run = promisify(execFile);
const ID = PIPELINE_DATA_SCENARIO.id;
let dataDir = '';
let atlas: EstimateAtlas;

beforeAll(async () => {
  dataDir = (await buildPipelineData({ withScenario: true })).dataDir;
  atlas = await openEstimateAtlas(dataDir);
}, 900_000);

const base = (o: Partial<EstimateOptions> = {}): EstimateOptions => ({
  atlas: dataDir,
  region: 'sollent-coast',
  start: '2027-05-03',
  workHours: '20000',
  crew: '20',
  rate: '35',
  dailyCost: '1500',
  currency: 'EUR',
  ...o,
});

describe('the estimate on the atlas\u2019s scenarios', () => {
  it('the context lists the scenario with the manifest\u2019s words, and its tiles are the record\u2019s paths moved into data/scenarios/<id>/, present in the build', () => {
    expect(atlas.ctx.scenarios.map((s) => s.id)).toEqual([ID]);
    const s = atlas.ctx.scenarios[0];
    expect(s.kind).toBe('uniform warming');
    expect(s.what).toMatch(/\+2\.00 K/);
    expect(s.dataPath).toBe(`data/scenarios/${ID}/`);
    expect(atlas.ctx.scenarioCaveat).toBe(SCENARIO_CAVEAT);
    expect(scenarioPath('data/calculator/sollent-coast.bin', s)).toBe(`data/scenarios/${ID}/calculator/sollent-coast.bin`);
    const sctx = scenarioContext(atlas.ctx, s);
    for (const r of sctx.regions) expect(existsSync(join(dataDir, r.path)), r.path).toBe(true);
    for (const c of sctx.cells!.chunks) expect(existsSync(join(dataDir, c.path)), c.path).toBe(true);
  });

  it('a warmer scenario never finishes earlier than the record for the same job: every region, weather year and start month; and it adds days somewhere', async () => {
    let later = 0;
    let compared = 0;
    for (const r of atlas.ctx.regions) {
      for (const o of [{}, { class: 'high', unacclimatized: true }, { shade: true, crew: '8' }] as Array<Partial<EstimateOptions>>) {
        const j = await runEstimateCommand(base({ region: r.id, scenario: [ID], ...o }));
        const s = j.scenarios[0];
        expect(s.weatherYears).toEqual(j.weatherYears);
        j.years.forEach((y, i) => {
          expect(s.years[i].weatherYear).toBe(y.weatherYear);
          expect(s.years[i].finishDate >= y.finishDate, `${r.id} ${y.weatherYear}`).toBe(true);
          expect(s.years[i].crewHoursLost).toBeGreaterThanOrEqual(y.crewHoursLost - 0.01);
          compared++;
          if (s.years[i].finishDate > y.finishDate) later++;
        });
        j.startMonths.forEach((m, i) => {
          expect(s.startMonths[i].finishDate.p90 >= m.finishDate.p90, `${r.id} start ${m.start}`).toBe(true);
          expect(s.startMonths[i].addedWorkingDays.p50).toBeGreaterThanOrEqual(m.addedWorkingDays.p50);
        });
        expect(s.heatFree).toEqual(j.heatFree); // without heat the weather does not matter
      }
    }
    expect(compared).toBeGreaterThan(30);
    expect(later, 'the warming adds days in some years').toBeGreaterThan(0);
  });

  it('--scenarios all gives one entry per scenario with the record\u2019s fields, what the scenario is and the what-if caveat; without it there is none', async () => {
    const j = await runEstimateCommand(base({ scenarios: 'all', deadline: '2027-09-15' }));
    expect(j.scenarios).toHaveLength(1);
    const s = j.scenarios[0];
    for (const k of [
      'weatherYears',
      'weatherYearsLeftOut',
      'heatFree',
      'finishDate',
      'workingDays',
      'calendarDays',
      'addedWorkingDays',
      'addedCalendarDays',
      'crewHoursLost',
      'crewHoursAbove',
      'cost',
      'years',
      'startMonths',
      'shiftPatterns',
      'crewForDeadline',
    ] as const) {
      expect(s, k).toHaveProperty(k);
      expect(typeof s[k], k).toBe(typeof j[k]);
    }
    expect(Object.keys(s.finishDate)).toEqual(['mean', 'p50', 'p90']);
    expect(Object.keys(s.cost)).toEqual(['mean', 'p50', 'p90']);
    expect(s.startMonths).toHaveLength(12);
    expect(s.caveat).toBe(SCENARIO_CAVEAT);
    expect(j.scenarioCaveat).toBe(SCENARIO_CAVEAT);
    expect(s.source).toMatch(/not derived from a climate model/);
    // A crew that meets the deadline on the record meets it on the warmer scenario only with as many workers or more.
    if (j.crewForDeadline && s.crewForDeadline) expect(s.crewForDeadline.crew).toBeGreaterThanOrEqual(j.crewForDeadline.crew);
    expect(await runEstimateCommand(base({ scenario: [ID, ID] }))).toEqual(await runEstimateCommand(base({ scenarios: ID })));
    const plain = await runEstimateCommand(base());
    expect(plain.scenarios).toEqual([]);
    expect(plain.scenarioCaveat).toBe('');
    // The text and the CSV say what the scenario is and that it is not a forecast.
    const text = formatEstimate(j);
    expect(text).toMatch(/What-if climates[^\n]*not forecasts/);
    expect(text).toContain(s.what);
    expect(text).toContain(SCENARIO_CAVEAT);
    const csv = bidCsv(j);
    expect(csv).toContain(`Scenario ${ID}: `);
    expect(csv).toMatch(/what-if, not a forecast/);
    const p90 = csv.split('\n').find((l) => l.startsWith(`scenario,${ID},addedWorkingDays,p90,`))!;
    expect(Number(p90.split(',')[4])).toBe(s.addedWorkingDays.p90);
  });

  it('the workbook gains a What-if climates sheet that openpyxl (Debian python3-openpyxl) reads back with the record\u2019s and the scenario\u2019s figures, what the scenario is and the caveat', async () => {
    const j = await runEstimateCommand(base({ scenarios: 'all' }));
    const path = join(mkdtempSync(join(tmpdir(), 'estimate-scenario-xlsx-')), 'bid.xlsx');
    writeFileSync(path, await workbookBytes(bidSheets(j), { title: 'test', created: new Date(j.atlas.buildTime) }));
    const xl = await run('/usr/bin/python3', [
      '-c',
      [
        'import json, sys, openpyxl',
        'wb = openpyxl.load_workbook(sys.argv[1], read_only=True)',
        'print(json.dumps({ws.title: [[c for c in row] for row in ws.iter_rows(values_only=True)] for ws in wb.worksheets}, default=str))',
      ].join('\n'),
      path,
    ]);
    const book = JSON.parse(xl.stdout) as Record<string, Array<Array<string | number | null>>>;
    expect(Object.keys(book)).toEqual(['Schedule', 'Years', 'Start months', 'Shift patterns', 'Assumptions', 'Cautions', 'What-if climates']);
    const sheet = book['What-if climates'];
    expect(sheet[0].slice(3)).toEqual(['Record (past weather)', `${j.scenarios[0].name} (${ID})`]);
    const p90 = sheet.find((r) => r[0] === 'Working days added by heat' && r[2] === 'P90 year')!;
    expect(p90.slice(3, 5)).toEqual([j.addedWorkingDays.p90, j.scenarios[0].addedWorkingDays.p90]);
    expect(JSON.stringify(sheet)).toContain(j.scenarios[0].what);
    expect(JSON.stringify(sheet)).toContain('not a forecast');
    expect(bidSheets(await runEstimateCommand(base())).map((x) => x.name)).not.toContain('What-if climates');
  });

  it('an unknown scenario id is the catalogued EstimateScenarioUnknown with the ids in its hint (CLI and form alike); the command exits 2 and writes no file', async () => {
    await expectCataloguedAsync(() => runEstimateCommand(base({ scenario: ['plus-9k'] })), 'EstimateScenarioUnknown', /plus-9k/);
    const e = await runEstimateCommand(base({ scenarios: `${ID},nope` })).catch((x) => x);
    expect(e.hint).toBe(`use one of: ${ID}, or \`all\` for every one (scenarios are what-ifs, not forecasts)`);
    expect(e.where.key).toBe('scenario');
    // On an atlas without scenarios the hint says there are none.
    expectCatalogued(() => parseScenarios([ID], { ...atlas.ctx, scenarios: [] }), 'EstimateScenarioUnknown', /has no scenarios/);
    expect(parseScenarios(['none', '', ' '], atlas.ctx)).toEqual([]);
    expect(parseScenarios(['all', ID], atlas.ctx)).toEqual([ID]);
    const out = mkdtempSync(join(tmpdir(), 'estimate-scenario-'));
    const csvPath = join(out, 'bid.csv');
    const r = await run(
      process.execPath,
      [join(PROJECT_ROOT, 'bin/heathours-ts.mjs'), 'estimate', '--atlas', dataDir, '--region', 'sollent-coast', '--scenario', 'plus-9k', '--csv', csvPath],
      { maxBuffer: 1 << 24 },
    ).catch((x: { code: number; stderr: string }) => x);
    expect((r as { code: number }).code).toBe(2);
    expect((r as { stderr: string }).stderr).toMatch(new RegExp(`EstimateScenarioUnknown[\\s\\S]*hint: use one of: ${ID}`));
    expect(existsSync(csvPath)).toBe(false);
  }, 60_000);
});
