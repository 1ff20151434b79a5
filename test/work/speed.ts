/**
 * Speed of the work kernels, one core: `npx tsx test/work/speed.ts [cellHours]`.
 * Prints ns per evaluation with the input size and a checksum of the results. Input: an invented
 * (synthetic) WBGT field, uniform-ish over 10–38 °C in the sun and 2–6 °C cooler in the shade.
 * The machine is shared, so figures are noisy; each is the best of 5 runs.
 */
import {
  aboveLimitInto,
  kjellstrom2018LossInto,
  localHours,
  prepareWorkKernel,
  resolveWorkSettings,
  parseWorkSettings,
  DEFAULT_WORKLOAD_CLASSES,
  evaluationFractionInto,
  workFractionInto,
  type WorkKernel,
} from '../../pipeline/work/index.ts';

const n = Number(process.argv[2] ?? 1_000_000);
const sun = new Float32Array(n);
const shade = new Float32Array(n);
let s = 12345;
for (let i = 0; i < n; i++) {
  s = (Math.imul(s, 1103515245) + 12345) >>> 0;
  sun[i] = 10 + 28 * (s / 4294967296);
  shade[i] = sun[i] - 2 - 4 * ((i * 0.618034) % 1);
}
const out = new Float32Array(n);
const flag = new Uint8Array(n);

function best(label: string, evalsPerRun: number, run: () => number): void {
  let bestMs = Infinity;
  let checksum = 0;
  for (let r = 0; r < 5; r++) {
    const t = performance.now();
    checksum = run();
    bestMs = Math.min(bestMs, performance.now() - t);
  }
  console.log(`${label.padEnd(58)} ${((bestMs * 1e6) / evalsPerRun).toFixed(2).padStart(8)} ns/eval  n=${evalsPerRun}  checksum=${checksum.toFixed(3)}`);
}
const sum = (a: Float32Array | Uint8Array) => {
  let t = 0;
  for (let i = 0; i < a.length; i++) t += a[i];
  return t;
};
const kernel = (model: 'curve-2017' | 'table-1989', rate = 415): WorkKernel =>
  prepareWorkKernel({ workRate: rate, restRate: 115, limit: { model, acclimatization: 'acclimatized' } });

best('workFractionInto curve-2017, rest in same place', n, () => sum(workFractionInto(out, sun, null, kernel('curve-2017'))));
best('workFractionInto curve-2017, rest in shade (Newton)', n, () => sum(workFractionInto(out, sun, shade, kernel('curve-2017'))));
best('workFractionInto table-1989, rest in same place', n, () => sum(workFractionInto(out, sun, null, kernel('table-1989'))));
best('workFractionInto table-1989, rest in shade', n, () => sum(workFractionInto(out, sun, shade, kernel('table-1989'))));
best('aboveLimitInto', n, () => sum(aboveLimitInto(flag, sun, kernel('curve-2017'))));
best('kjellstrom2018LossInto (400 W)', n, () => sum(kjellstrom2018LossInto(out, sun, 400)));

for (const restLocation of ['same-place', 'shade'] as const) {
  const r = resolveWorkSettings(parseWorkSettings({ restLocation }), DEFAULT_WORKLOAD_CLASSES);
  const outs = r.evaluations.map(() => new Float32Array(n));
  // Timed: the 16 kernels only (above the limit ⇔ f < 1, so no second pass); checksum after.
  let bestMs = Infinity;
  for (let rep = 0; rep < 5; rep++) {
    const t = performance.now();
    r.evaluations.forEach((e, j) => evaluationFractionInto(outs[j], sun, shade, e));
    bestMs = Math.min(bestMs, performance.now() - t);
  }
  let checksum = 0;
  for (const o of outs) for (let i = 0; i < n; i++) checksum += o[i] + (o[i] < 1 ? 1 : 0);
  console.log(
    `${`all ${r.evaluations.length} evaluations, rest ${restLocation}, per cell-hour`.padEnd(58)} ${((bestMs * 1e6) / n).toFixed(2).padStart(8)} ns/cell-hour  n=${n}  checksum=${checksum.toFixed(3)}`,
  );
}

const hours = Float64Array.from({ length: 50_000 }, (_, i) => Date.UTC(2001, 0, 1) + (i + 1) * 3_600_000);
for (const zone of ['America/Chicago', 'Asia/Kolkata']) {
  const t0 = performance.now();
  const first = localHours(hours, zone);
  const firstMs = performance.now() - t0;
  best(
    `localHours ${zone} (first call incl. offset table: ${firstMs.toFixed(1)} ms)`,
    hours.length,
    () => sum(localHours(hours, zone).inShift) + sum(first.hour),
  );
}
