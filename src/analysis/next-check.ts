import type { Target, Verdict } from './types.js';

export interface NextCheck {
  readonly check: string;
  /** One line a technician understands. */
  readonly why: string;
}

/**
 * The next check to make (DESIGN §5).
 *
 * 1. Safety first: every unpowered check (rail to ground) before any power;
 *    a rail that failed or is marginal is measured again after the short is
 *    found — nothing is powered meanwhile.
 * 2. Then the idle current at first power through a current-limited supply.
 *    An idle current above the limit (fail) or at the limit (marginal) returns
 *    `rails.idle-current` again with a why that starts with "power off:", so a
 *    caller can stop the run; the idle current is the next reading once fixed.
 * 3. A rail DC level out of band is read again before any stage is probed: every
 *    stage target assumes the rails.
 * 4. When the last stage reading failed or was marginal, the most informative
 *    upstream check not yet made: the input stage's checks first (the output
 *    that feeds the stage before its other checks), then further upstream.
 * 5. Otherwise the next check not yet made, in plan order.
 *
 * Returns null when every check has a reading.
 */
export function nextCheck(
  targets: readonly Target[],
  done: ReadonlyMap<string, Verdict>,
  last?: { readonly check: string; readonly verdict: Verdict },
): NextCheck | null {
  const pending = (t: Target): boolean => !done.has(t.check);

  for (const t of targets.filter((x) => x.phase === 'unpowered')) {
    const v = done.get(t.check);
    if (v === undefined) return { check: t.check, why: `power off: measure ${t.check} first (a short to ground must be found before any power is applied)` };
    if (v !== 'pass') {
      return {
        check: t.check,
        why: `power off: ${t.check} read ${v === 'fail' ? 'below' : 'at'} the short limit; find the short (polarised capacitor, solder bridge, reversed part), then measure again`,
      };
    }
  }

  const idle = targets.find((x) => x.phase === 'first-power');
  if (idle) {
    const v = done.get(idle.check);
    if (v === undefined) return { check: idle.check, why: 'first power through a current-limited supply: read the idle current before probing anything' };
    if (v === 'fail')
      return { check: idle.check, why: 'power off: the idle current is above the limit; look for a hot or reversed part before powering again' };
    if (v === 'marginal')
      return { check: idle.check, why: 'power off: the idle current is at the limit; check for a warm part, then power up and read it again' };
  }

  for (const t of targets.filter((x) => x.phase === 'rails')) {
    const v = done.get(t.check);
    if (v === 'fail' || v === 'marginal') {
      return { check: t.check, why: `${t.check} is out of band: fix the supply and read it again before probing stages (every stage target assumes it)` };
    }
  }
  const rail = targets.find((x) => x.phase === 'rails' && pending(x));
  if (rail) return { check: rail.check, why: `rails before stages: read ${rail.check}` };

  if (last && last.verdict !== 'pass') {
    const failed = targets.find((t) => t.check === last.check);
    if (failed && failed.phase === 'stage') {
      const suggestion = upstreamSuggestion(targets, failed, pending);
      if (suggestion) return suggestion;
    }
  }

  const next = targets.find(pending);
  if (!next) return null;
  if (last && last.verdict !== 'pass') {
    return {
      check: next.check,
      why: `nothing upstream of ${last.check} is left unmeasured: the cause is likely in its own stage; then go on with ${next.check}`,
    };
  }
  return { check: next.check, why: `next in plan order${next.testPoint ? ` (at ${next.testPoint})` : ''}` };
}

/** The upstream check not yet made that says most about a failed stage reading. */
function upstreamSuggestion(targets: readonly Target[], failed: Target, pending: (t: Target) => boolean): NextCheck | null {
  const upstream = failed.upstream ?? precedingStages(targets, failed.stage);
  for (const [depth, stage] of upstream.entries()) {
    const candidates = targets.filter((t) => t.stage === stage && pending(t));
    if (candidates.length === 0) continue;
    // The output that feeds the chain toward the failed stage tells most, then the stage's other checks.
    const feeding = depth === 0 ? failed.input : targets.find((t) => t.stage === upstream[depth - 1])?.input;
    const pick = (feeding && candidates.find((t) => t.check.startsWith(`${feeding}.`))) || candidates[0];
    if (!pick) continue;
    const verdict = failed.check;
    return {
      check: pick.check,
      why: `${verdict} is off: check upstream first — ${pick.check} ${depth === 0 ? 'feeds' : 'is further up the chain of'} stage ${failed.stage}`,
    };
  }
  return null;
}

/** Without `upstream` on the targets, every stage earlier in chain order, nearest first. */
function precedingStages(targets: readonly Target[], stage: string): string[] {
  const order: string[] = [];
  for (const t of targets) if (t.phase === 'stage' && !order.includes(t.stage)) order.push(t.stage);
  const at = order.indexOf(stage);
  return at <= 0 ? [] : order.slice(0, at).reverse();
}
