// Diode shaper speed: one evaluation (Newton node solve on half the samples of a
// mirrored triangle, then an FFT for THD) of the demo exciter's shaper, against
// the parts it is made of and the direct-DFT THD of waveform.ts. The tolerance
// engine evaluates it once per Monte Carlo trial, as a trial (isTrial: the
// transfer curve at knots, interpolated); goal well under 15 µs. The last lines
// give how far a trial's output and THD lie from the full solve over random
// corners of the demo shaper's tolerance box.
// Times are CPU time of this process (process.cpuUsage), not wall time.
// Figures and ratios from one run; nothing here fails a build.
import { loadPlanFile } from '../src/plan/load.js';
import { fastThd } from '../src/circuit/spectrum.js';
import { fromPhase, thd } from '../src/circuit/waveform.js';
import { defaultOpamp } from '../src/circuit/opamp.js';
import type { EvalInput } from '../src/circuit/types.js';
import { type DiodeShaperSettings, shaperNet } from '../src/circuit/diode-shaper.js';
import { mirrorOrder } from '../src/circuit/mirror.js';
import { solveNode } from '../src/circuit/shaper-solver.js';
import { createRandom } from '../src/analysis/random.js';
import { lambertFromTable, lambertTable, lambertWOfExp } from '../src/circuit/lambert-w.js';
import { lambertW0Log } from 'lambert-w-function';
import { cpuPerCall } from './timing.js';

const plan = await loadPlanFile('demo/exciter.plan.json');
const stage = plan.stages.find((s) => s.kind === 'diode-shaper');
if (!stage) throw new Error('the demo plan has no diode-shaper stage');
const parts = Object.fromEntries(Object.entries(stage.parts).map(([k, v]) => [k, v.nominal]));
// The demo's own triangle level (about 3.2 V peak), 256 samples as the chain carries it.
const triangle = fromPhase(2400, (p) => 3.2 * (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4));
const skewed = Float64Array.from(triangle.samples);
skewed[40] = (skewed[40] as number) + 1e-6; // breaks the mirror: every sample solved
const input: EvalInput<unknown> = { parts, settings: stage.settings, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {}, input: triangle };
const unmirrored: EvalInput<unknown> = { ...input, input: { frequency: 2400, samples: skewed } };

/** CPU µs per call, after 2,000 untimed calls. */
const perCall = (n: number, f: () => void): number => cpuPerCall(n, f, 2000);

let sink = 0;
const n = 20_000;
const shaper = perCall(n, () => {
  sink += stage.module.evaluate(input).values['out.vpp'] ?? 0;
});
const trialInput: EvalInput<unknown> = { ...input, isTrial: true };
const trial = perCall(n, () => {
  sink += stage.module.evaluate(trialInput).values['out.vpp'] ?? 0;
});
const full = perCall(n, () => {
  sink += stage.module.evaluate(unmirrored).values['out.vpp'] ?? 0;
});
const out = stage.module.evaluate(input).outputs['out'];
if (!out) throw new Error('no output');
const viaFft = perCall(n, () => {
  sink += fastThd(out.samples);
});
const direct = perCall(n / 10, () => {
  sink += thd(out);
});
let exps = 0;
const expRef = perCall(n, () => {
  for (let i = 0; i < 512; i++) exps += Math.exp(i * 1e-3);
});

console.log(`branches ${(stage.settings as { branches: unknown[] }).branches.length}, samples ${triangle.samples.length}`);
console.log(`shaper evaluate (mirrored triangle)   ${shaper.toFixed(2)} µs`);
console.log(`shaper evaluate (every sample solved) ${full.toFixed(2)} µs   ratio ${(full / shaper).toFixed(2)}`);
console.log(`shaper evaluate as a trial (knots)    ${trial.toFixed(2)} µs   ratio to mirrored ${(trial / shaper).toFixed(2)}`);
console.log(`THD by FFT (fft.js)                   ${viaFft.toFixed(2)} µs`);
console.log(`THD by direct DFT (waveform.ts)       ${direct.toFixed(2)} µs   ratio to FFT ${(direct / viaFft).toFixed(1)}`);
console.log(`512 × Math.exp (machine yardstick)    ${expRef.toFixed(2)} µs   shaper / yardstick ${(shaper / expRef).toFixed(2)}`);
const plan0 = mirrorOrder(triangle.samples);
const steps = solveNode(shaperNet(input as EvalInput<DiodeShaperSettings>), triangle.samples, plan0.order, new Float64Array(triangle.samples.length));
console.log(
  `Newton steps per solved sample        ${(steps / plan0.order.length).toFixed(2)} (${plan0.order.length} of ${triangle.samples.length} samples solved)`,
);
console.log(`10,000 shaper evaluations             ${(shaper * 10).toFixed(1)} ms`);

// Lambert's W of e^L, as the trial's knots read it (a table) against computing it each time:
// our Newton steps (lambertWOfExp) and the registry's lambert-w-function (lambertW0Log).
const table = lambertTable();
const levels = Float64Array.from({ length: 512 }, (_, i) => -20 + (i * 60) / 512);
const fromTable = perCall(n, () => {
  for (let i = 0; i < 512; i++) sink += lambertFromTable(table, levels[i] as number);
});
const byNewton = perCall(n / 10, () => {
  for (let i = 0; i < 512; i++) sink += lambertWOfExp(levels[i] as number);
});
const byLibrary = perCall(n / 10, () => {
  for (let i = 0; i < 512; i++) sink += lambertW0Log(levels[i] as number);
});
console.log(`512 × W(e^L) from the table           ${fromTable.toFixed(2)} µs`);
console.log(`512 × W(e^L) by Newton, each time     ${byNewton.toFixed(2)} µs   ratio to the table ${(byNewton / fromTable).toFixed(1)}`);
console.log(`512 × W(e^L) by lambert-w-function    ${byLibrary.toFixed(2)} µs   ratio to the table ${(byLibrary / fromTable).toFixed(1)}`);
if (!Number.isFinite(sink + exps)) console.log('(sink)');

// A trial against the full solve over random corners of the tolerance box (seeded, invented spread).
const random = createRandom(3);
let worstSample = 0;
let worstThd = 0;
for (let t = 0; t < 300; t++) {
  const p: Record<string, number> = {};
  for (const [k, v] of Object.entries(stage.parts)) p[k] = v.nominal * (1 + v.tol * (2 * random.next() - 1));
  const drive = 3.2 * (1 + 0.05 * (2 * random.next() - 1));
  const skew = 0.5 + 0.02 * (2 * random.next() - 1);
  const tri = fromPhase(2400, (x) => (x < skew ? drive * ((2 * x) / skew - 1) : drive * (1 - (2 * (x - skew)) / (1 - skew))));
  const exact = stage.module.evaluate({ ...input, parts: p, input: tri });
  const fast = stage.module.evaluate({ ...input, parts: p, input: tri, isTrial: true });
  const a = exact.outputs['out']?.samples ?? new Float64Array(0);
  const b = fast.outputs['out']?.samples ?? new Float64Array(0);
  for (let i = 0; i < a.length; i++) worstSample = Math.max(worstSample, Math.abs((a[i] as number) - (b[i] as number)));
  worstThd = Math.max(worstThd, Math.abs((exact.values['out.thd'] ?? 0) - (fast.values['out.thd'] ?? 0)));
}
console.log(
  `trial vs full solve, 300 random corners: largest sample difference ${(worstSample * 1e6).toFixed(1)} µV, largest THD difference ${worstThd.toExponential(2)}`,
);
