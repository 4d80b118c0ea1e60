import { useEffect, useRef, useState } from 'react';
import { Box, Text, useInput } from 'ink';
import type { Plan } from '../../plan/types.js';
import type { PlanCatalog } from '../bench/plan-catalog.js';
import { toneProps } from '../theme.js';
import type { PlanEditAccess, PlanEditTarget } from './plan-edit-access.js';
import { PlanEditor } from './plan-editor.js';

export interface PlanEditorScreenProps {
  readonly catalog: PlanCatalog;
  /** The plan to edit (the one the plan screen shows). */
  readonly planHash: string;
  readonly access: PlanEditAccess;
  readonly width: number;
  readonly height: number;
  /** @default true */
  readonly isActive?: boolean;
  /** The editor is left: with the plan as saved (now in the catalog), or null when nothing was saved. */
  readonly onDone: (saved: Plan | null) => void;
}

type Opened = { kind: 'opening' } | { kind: 'ready'; plan: Plan; target: PlanEditTarget } | { kind: 'reloading' } | { kind: 'error'; message: string };

const message = (error: unknown) => (error instanceof Error ? error.message : String(error));

/**
 * The plan editor inside the app, on a plan of the catalog: opened through the
 * CLI's access (which file, its text on disk), saved through its save path, and
 * the saved plan loaded again into the catalog when the editor is left.
 */
export function PlanEditorScreen({ catalog, planHash, access, width, height, isActive = true, onDone }: PlanEditorScreenProps) {
  const [state, setState] = useState<Opened>({ kind: 'opening' });
  const hasSaved = useRef(false);
  useEffect(() => {
    let isLive = true;
    void (async () => {
      const plan = await catalog.byHash(planHash);
      if (!plan) throw new Error(`plan ${planHash.slice(0, 8)} is neither given with --plan nor kept in the log`);
      const target = await access.open(plan, catalog.originOf(plan));
      if (isLive) setState({ kind: 'ready', plan, target });
    })().catch((error: unknown) => isLive && setState({ kind: 'error', message: message(error) }));
    return () => {
      isLive = false;
    };
  }, [catalog, planHash, access]);

  const leave = (plan: Plan, target: PlanEditTarget) => {
    if (!hasSaved.current) return onDone(null);
    setState({ kind: 'reloading' });
    target
      .reload()
      .then((next) => {
        catalog.saved(next, plan);
        onDone(next);
      })
      .catch((error: unknown) => setState({ kind: 'error', message: `saved, but it does not load again: ${message(error)}` }));
  };

  useInput(
    (_input, key) => {
      if (key.escape && state.kind === 'error') onDone(null);
    },
    { isActive: isActive && state.kind === 'error' },
  );

  if (state.kind === 'ready') {
    const { plan, target } = state;
    return (
      <PlanEditor
        file={target.file}
        initial={target.draft}
        savedText={target.savedText}
        save={(text) => {
          target.save(text);
          hasSaved.current = true;
        }}
        onExit={() => leave(plan, target)}
        width={width}
        height={height}
        trials={catalog.settings().trials}
        isActive={isActive}
      />
    );
  }
  return (
    <Box flexDirection="column" width={width}>
      {state.kind === 'error' ? (
        <Text {...toneProps('bad')}>✗ {state.message}</Text>
      ) : (
        <Text>{state.kind === 'opening' ? 'opening the plan in the editor…' : 'loading the saved plan…'}</Text>
      )}
      <Text {...toneProps('dim')}>{state.kind === 'error' ? 'Esc back to the plan screen' : ' '}</Text>
    </Box>
  );
}
