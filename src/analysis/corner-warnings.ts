import { type Chain, type ChainDetail, spreadOf } from '../plan/chain.js';
import type { DesignWarning } from './types.js';

/**
 * Stage warnings that the nominal design does not raise but a tolerance corner
 * does (an output that clips only when the gain parts sit at their limits, a
 * stage that slews at the top of its range). For every stage check, the two
 * corners its sensitivities point to (as in the worst case) are evaluated in
 * full, and the first new warning of each stage is kept — one per stage, so a
 * technician reads the risk once. Corners lie inside the tolerance box, so
 * each such warning can happen on a real board.
 */
export function cornerWarnings(chain: Chain, perSigma: readonly Float64Array[], nominal: ChainDetail): DesignWarning[] {
  const seenAtNominal = new Set(nominal.warnings.map((w) => `${w.stage}\u0000${w.message}`));
  const stagesWithNominal = new Set(nominal.warnings.map((w) => w.stage));
  const found = new Map<string, DesignWarning>();
  const x = Float64Array.from(chain.nominal);
  const evaluated = new Map<string, ChainDetail>();
  chain.checks.forEach((check, c) => {
    if (check.phase !== 'stage' || found.has(check.stage) || stagesWithNominal.has(check.stage)) return;
    // Rails also set the headroom, which the signal's sensitivities do not see: try them low and high too.
    const corners = [1, -1].flatMap((direction) => (['follow', 'low', 'high'] as const).map((rails) => ({ direction, rails })));
    for (const { direction, rails } of corners) {
      let moved = false;
      chain.variables.forEach((v, i) => {
        const d = perSigma[i]?.[c] ?? 0;
        let sign = d === 0 || spreadOf(v) === 0 ? 0 : Math.sign(d) * direction;
        if (v.stage === 'rails' && rails !== 'follow') sign = rails === 'low' ? -1 : 1;
        x[i] = v.nominal + sign * spreadOf(v);
        if (sign !== 0) moved = true;
      });
      if (!moved) continue;
      // A stage's warnings depend only on it and the stages upstream of it. Checks of one stage
      // often point to the same corner: each corner is evaluated once (the same detail either way).
      const depth = chain.stageIndex(check.stage) + 1;
      const key = `${depth}:${x.join(',')}`;
      const detail = evaluated.get(key) ?? chain.detail(x, depth);
      evaluated.set(key, detail);
      const fresh = detail.warnings.find((w) => w.stage === check.stage && !seenAtNominal.has(`${w.stage}\u0000${w.message}`));
      if (fresh) {
        found.set(check.stage, {
          stage: check.stage,
          message: `at the tolerance corner that ${direction > 0 ? 'raises' : 'lowers'} ${check.check} most${rails === 'follow' ? '' : ` with the rails ${rails}`}: ${fresh.message}`,
        });
        break;
      }
    }
  });
  return [...found.values()];
}
