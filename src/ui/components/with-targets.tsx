import { type ReactNode, useEffect, useState } from 'react';
import { Box, Text, useInput } from 'ink';
import type { TargetSet } from '../../analysis/types.js';
import type { Plan } from '../../plan/types.js';
import type { PlanCatalog } from '../bench/plan-catalog.js';
import { toneProps } from '../theme.js';

export interface WithTargetsProps {
  readonly catalog: PlanCatalog;
  readonly planHash: string;
  readonly children: (plan: Plan, targets: TargetSet) => ReactNode;
  /** Esc while loading, or after an error. */
  readonly onExit: () => void;
  /** @default true */
  readonly isActive?: boolean;
}

type Loaded = { kind: 'loading'; what: string } | { kind: 'ready'; plan: Plan; targets: TargetSet } | { kind: 'error'; message: string };

/**
 * Find a plan by hash and compute its targets, showing a line while the Monte
 * Carlo runs (drawn first: the computation blocks the event loop for a moment).
 */
export function WithTargets({ catalog, planHash, children, onExit, isActive = true }: WithTargetsProps) {
  const [state, setState] = useState<Loaded>({ kind: 'loading', what: 'finding the plan…' });
  useEffect(() => {
    let isLive = true;
    void (async () => {
      const plan = await catalog.byHash(planHash);
      if (!isLive) return;
      if (!plan) {
        const why = catalog.broken.get(planHash);
        setState({ kind: 'error', message: why ?? `plan ${planHash.slice(0, 8)} is neither given with --plan nor kept in the log` });
        return;
      }
      if (catalog.hasTargets(plan)) {
        setState({ kind: 'ready', plan, targets: catalog.targets(plan) });
        return;
      }
      const what = `computing the targets of ${plan.plan} (worst case and Monte Carlo)…`;
      setState({ kind: 'loading', what });
      // Later than Ink's 30 fps render throttle, so the line above is on screen
      // first even when the computation has to run on this thread.
      await new Promise((r) => setTimeout(r, 60));
      if (!isLive) return;
      try {
        const targets = await catalog.targetsAsync(plan, (done, total) => {
          if (isLive) setState({ kind: 'loading', what: `${what} ${Math.round((100 * done) / total)} %` });
        });
        if (isLive) setState({ kind: 'ready', plan, targets });
      } catch (error) {
        if (isLive) setState({ kind: 'error', message: error instanceof Error ? error.message : String(error) });
      }
    })().catch((error: unknown) => isLive && setState({ kind: 'error', message: error instanceof Error ? error.message : String(error) }));
    return () => {
      isLive = false;
    };
  }, [catalog, planHash]);
  const [isHelpOpen, setHelpOpen] = useState(false);
  useInput(
    (input, key) => {
      if (key.escape) onExit();
      else if (input === '?') setHelpOpen((open) => !open);
    },
    { isActive: isActive && state.kind !== 'ready' },
  );
  if (state.kind === 'ready') return <>{children(state.plan, state.targets)}</>;
  return (
    <Box flexDirection="column">
      {state.kind === 'loading' ? <Text>{state.what}</Text> : <Text {...toneProps('bad')}>✗ {state.message}</Text>}
      <Text {...toneProps('dim')}>Esc back · ? help</Text>
      {isHelpOpen ? (
        <Text wrap="wrap" {...toneProps('dim')}>
          Help — the targets of a plan follow from its part values and tolerances: the worst case over the tolerance box and a seeded Monte Carlo. They are
          computed once per plan and kept in a cache, so the next visit opens at once. Esc goes back to the bench. ? closes this help.
        </Text>
      ) : null}
    </Box>
  );
}
