/**
 * `estimate-replay`: the estimate's schedule for one place, a 20,000 crew-hour job (20 workers,
 * 07:00–17:00 Monday–Saturday, so 100 working days without heat), with the comparison of the 12
 * start months (and two other shift patterns), on the invented small test atlas with its one
 * scenario (test/site/pipeline-data.ts `withScenario`: 3 weather years, a uniform warming of 2 K).
 *
 * Two figures, measured in one run on the shared machine (compare ratios, not absolute times):
 * - `path=node`: the browser's code path under Node (pipeline/schedule: parse the inputs, decode
 *   the region's tile, replay), median of 15 runs after 3 warm-up runs [ms]; beside it the
 *   monthly table of the same inputs (src/lib/estimate) in the same run, and their ratio;
 * - `path=node-scenarios`: the same with the job replayed on every scenario too (runScenarios:
 *   decode the scenario's tile, replay, 12 start months), and the ratio to `path=node`;
 * - `path=chromium`: the page in Debian's Chromium, from opening the link to the results shown
 *   (`data-state=ready`), median of 5 fresh pages [ms]; and the page's own time from reading the
 *   form to the results drawn (`data-ms`); without scenarios (`scenario=none`) and, as
 *   `path=chromium-scenarios`, with every scenario.
 * The checksum is the sum of the P90 added working days of the 12 start months.
 */
import type { Bench, BenchFigure } from './types.ts';
import { buildPipelineData } from '../test/site/pipeline-data.ts';
import { buildTestSite, startSiteSession } from '../test/site/browser.ts';
import { openEstimateAtlas } from '../pipeline/run/estimate-atlas.ts';
import { parseInputs, type RawInputs } from '../pipeline/schedule/inputs.ts';
import { loadPlace } from '../pipeline/schedule/place.ts';
import { runBid } from '../pipeline/schedule/run-bid.ts';
import { runScenarios } from '../pipeline/schedule/scenario-runs.ts';
import { runEstimate } from '../src/lib/estimate/estimate.ts';

const RAW: RawInputs = {
  region: 'sollent-coast',
  start: '2027-05-03',
  'work-hours': '20000',
  crew: '20',
  rate: '35',
  'daily-cost': '1500',
  currency: 'EUR',
  compare: ['05:00-11:00, 15:00-19:00', '20:00-04:00'],
};
const QUERY =
  'region=sollent-coast&start=2027-05-03&work-hours=20000&crew=20&rate=35&daily-cost=1500&currency=EUR&compare=05%3A00-11%3A00%2C+15%3A00-19%3A00&compare=20%3A00-04%3A00';

const median = (a: number[]) => {
  const s = [...a].sort((x, y) => x - y);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

export const bench: Bench = {
  names: ['estimate-replay'],
  async run(): Promise<BenchFigure[]> {
    const data = await buildPipelineData({ withScenario: true });
    const atlas = await openEstimateAtlas(data.dataDir);
    const ctx = atlas.ctx;
    let checksum = 0;
    const load = (p: string) => atlas.load(p).then((b) => b.slice());
    let scenarioChecksum = 0;
    const once = async () => {
      const t0 = performance.now();
      const inputs = parseInputs(RAW, ctx, 'C');
      const { histograms } = await loadPlace(inputs.place, ctx, load);
      const r = runBid(histograms, inputs, ctx);
      const t1 = performance.now();
      runEstimate(histograms, inputs, ctx);
      const t2 = performance.now();
      const withScenarios = parseInputs({ ...RAW, scenario: ['all'] }, ctx, 'C');
      const { histograms: h2 } = await loadPlace(withScenarios.place, ctx, load);
      runBid(h2, withScenarios, ctx);
      const sr = await runScenarios(withScenarios, ctx, load);
      const t3 = performance.now();
      checksum = r.answer.startMonths.reduce((s, m) => s + m.addedWorkingDays.p90, 0);
      scenarioChecksum = sr.reduce((t, x) => t + x.run.answer.startMonths.reduce((s, m) => s + m.addedWorkingDays.p90, 0), 0);
      return { bid: t1 - t0, monthly: t2 - t1, scenarios: t3 - t2 };
    };
    for (let i = 0; i < 3; i++) await once();
    const runs = [];
    for (let i = 0; i < 15; i++) runs.push(await once());
    const bid = median(runs.map((r) => r.bid));
    const monthly = median(runs.map((r) => r.monthly));
    const withScenarios = median(runs.map((r) => r.scenarios));
    const out: BenchFigure[] = [
      {
        bench: 'estimate-replay',
        value: Number(bid.toFixed(1)),
        unit: 'ms',
        path: 'node',
        aim: '< 200 ms',
        input: `1 region, ${ctx.years.length} weather years, 20,000 crew-hours, 12 start months, 3 shift patterns`,
        monthlyTableMs: Number(monthly.toFixed(1)),
        ratioToMonthlyTable: Number((bid / monthly).toFixed(2)),
        checksum: Number(checksum.toFixed(2)),
      },
      {
        bench: 'estimate-replay',
        value: Number(withScenarios.toFixed(1)),
        unit: 'ms',
        path: 'node-scenarios',
        aim: '< 200 ms',
        input: `the same and the job on ${ctx.scenarios.length} scenario(s) (${ctx.scenarios.map((x) => x.id).join(', ')})`,
        ratioToNode: Number((withScenarios / bid).toFixed(2)),
        checksum: Number(scenarioChecksum.toFixed(2)),
      },
    ];
    const site = await buildTestSite(data.dataDir);
    const session = await startSiteSession(site.distDir);
    try {
      for (const [path, scenario] of [
        ['chromium', 'none'],
        ['chromium-scenarios', 'all'],
      ] as const) {
        const loads: number[] = [];
        const own: number[] = [];
        for (let i = 0; i < 6; i++) {
          const t0 = performance.now();
          const w = await session.open(`/estimate/?${QUERY}&scenario=${scenario}`);
          await w.page.waitForFunction(() => document.getElementById('estimate-app')?.dataset.state === 'ready', undefined, { timeout: 60_000 });
          const t1 = performance.now();
          const ms = Number(await w.page.getAttribute('#estimate-app', 'data-ms'));
          await w.page.close();
          if (i === 0) continue; // the first page warms the server and the browser's caches
          loads.push(t1 - t0);
          own.push(ms);
        }
        out.push({
          bench: 'estimate-replay',
          value: Number(median(loads).toFixed(0)),
          unit: 'ms',
          path,
          what: `open the link (scenario=${scenario}) to results shown, median of 5 fresh pages`,
          pageRunMs: Number(median(own).toFixed(1)),
          ratioToNode: Number((median(own) / (scenario === 'none' ? bid : withScenarios)).toFixed(2)),
          checksum: Number((scenario === 'none' ? checksum : scenarioChecksum).toFixed(2)),
        });
      }
    } finally {
      await session.close();
    }
    return out;
  },
};
