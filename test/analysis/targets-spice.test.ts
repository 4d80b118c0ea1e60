import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { loadPlanFile } from '../../src/plan/load.js';
import { runSpice } from '../helpers/ngspice.js';

/**
 * End to end through a real stage kind: the worst-case gain band of the demo
 * line driver's inverting stage must sit at the corners Rin low / Rf high and
 * Rin high / Rf low. ngspice (Debian package) solves the same circuit with a
 * high-gain controlled source as the op-amp (open-loop gain 2e5, the plan's
 * default aol) at each corner.
 */
function spiceGain(rin: number, rf: number): number {
  const netlist = [
    'vin in 0 dc 1',
    `rin in inm ${rin}`,
    `rf inm out ${rf}`,
    // Op-amp: out = aol · (v(+) − v(−)), non-inverting input at ground.
    'eamp out 0 0 inm 2e5',
  ].join('\n');
  const t = runSpice(netlist, 'dc vin 1 1 1', ['v(out)']);
  return t['v(out)']?.[0] ?? Number.NaN;
}

describe('worst-case band against ngspice at the corners', () => {
  test('line driver amp.gain: −Rf/Rin with finite gain, both corners within 0.01 %', async () => {
    const plan = await loadPlanFile('demo/line-driver.plan.json');
    const t = computeTargets(plan, { trials: 500 }).targets.find((x) => x.check === 'amp.gain');
    expect(t).toBeDefined();
    // Rin 10k 1 %, Rf 47k 1 % (demo/line-driver.plan.json).
    const most = spiceGain(9_900, 47_470); // largest magnitude, most negative
    const least = spiceGain(10_100, 46_530);
    const nominal = spiceGain(10_000, 47_000);
    expect(Math.abs((t?.worst.min ?? 0) / most - 1)).toBeLessThan(1e-4);
    expect(Math.abs((t?.worst.max ?? 0) / least - 1)).toBeLessThan(1e-4);
    // ngspice (spiceGain above) at the nominal parts: 1e-4.
    expect(Math.abs((t?.nominal ?? 0) / nominal - 1)).toBeLessThan(1e-4);
  });
});
