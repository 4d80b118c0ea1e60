import { readFile } from 'node:fs/promises';
import { describe, expect, test } from 'vitest';
import { buildChain, spreadOf } from '../../src/plan/chain.js';
import { loadPlanText } from '../../src/plan/load.js';

/*
 * The chain's incremental evaluation (stages upstream of every changed variable
 * keep their last results) must give exactly what a fresh evaluation gives.
 * Reference: the same plan's chain built anew for every point, so nothing is
 * carried over. A seeded walk over the demo exciter's box, one to three
 * variables moved at a time, with stage limits as the worst-case search uses
 * them. The demo plan is invented.
 */
describe('incremental chain evaluation', () => {
  test('400 moves through the box: every check equal to a fresh evaluation, bit for bit', async () => {
    const text = await readFile('demo/exciter.plan.json', 'utf8');
    const plan = loadPlanText(text, 'demo/exciter.plan.json');
    const chain = buildChain(plan);
    const varied = chain.variables.flatMap((v, i) => (spreadOf(v) > 0 ? [i] : []));
    let state = 12345;
    const next = (): number => {
      state = (Math.imul(state, 1103515245) + 12345) >>> 0;
      return state / 4294967296;
    };
    const x = Float64Array.from(chain.nominal);
    const out = new Float64Array(chain.checks.length);
    const fresh = new Float64Array(chain.checks.length);
    for (let step = 0; step < 400; step++) {
      const moves = 1 + Math.floor(next() * 3);
      for (let m = 0; m < moves; m++) {
        const i = varied[Math.floor(next() * varied.length)] as number;
        const v = chain.variables[i];
        if (v) x[i] = v.nominal + (2 * next() - 1) * spreadOf(v);
      }
      const depth = 1 + Math.floor(next() * plan.stages.length);
      chain.evaluate(x, out, depth);
      buildChain(plan).evaluate(x, fresh, depth);
      for (let c = 0; c < out.length; c++) expect(Object.is(out[c], fresh[c]), `${chain.checks[c]?.check} at step ${step}`).toBe(true);
    }
  });
});
