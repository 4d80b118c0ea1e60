import { useCallback, useState } from 'react';
import { Box, useApp, useInput } from 'ink';
import type { BenchLog } from '../log/types.js';
import type { InstrumentSource } from '../bench/source.js';
import type { Plan } from '../plan/types.js';
import { BatchScreen } from './batch/batch.js';
import { BenchScreen } from './bench/bench.js';
import type { PlanCatalog } from './bench/plan-catalog.js';
import { BringUpScreen } from './bring-up/bring-up.js';
import { ConfirmQuit } from './components/confirm-quit.js';
import { useLiveState } from './components/use-live-state.js';
import { type Size, useTerminalSize } from './components/use-terminal-size.js';
import { WithTargets } from './components/with-targets.js';
import { HistoryScreen } from './history/history.js';
import type { PlanEditAccess } from './plan-editor/plan-edit-access.js';
import { PlanEditorScreen } from './plan-editor/plan-editor-screen.js';
import { PlanScreen } from './plan-screen/plan-screen.js';

/** A screen and what it shows (DESIGN §8 names). */
export type Route =
  | { readonly screen: 'bench' }
  | { readonly screen: 'bring-up'; readonly serial: string; readonly planHash: string; readonly resumeRun?: string }
  | { readonly screen: 'history'; readonly serial: string }
  | { readonly screen: 'batch' }
  | { readonly screen: 'plan'; readonly planHash: string }
  | { readonly screen: 'plan-editor'; readonly planHash: string };

export interface AppProps {
  readonly log: BenchLog;
  readonly catalog: PlanCatalog;
  readonly operator: string;
  /** A fixed size instead of the terminal's (tests, benchmarks). */
  readonly size?: Partial<Size>;
  /** Where to start. @default bench */
  readonly initialRoute?: Route;
  /** Called instead of Ink's exit when the technician quits (tests). */
  readonly onQuit?: () => void;
  /** The bench's instruments, for the bring-up screen's `m` key. @default null */
  readonly instruments?: InstrumentSource | null;
  /** How the plan screen's `e` opens and saves a plan in the editor (the CLI gives it); none: no `e`. @default null */
  readonly planEditing?: PlanEditAccess | null;
}

/** Switches screens and owns the quit dialog; every screen keeps its own state. */
export function App({ log, catalog, operator, size, initialRoute = { screen: 'bench' }, onQuit, instruments = null, planEditing = null }: AppProps) {
  const app = useApp();
  const exit = onQuit ?? app.exit;
  const { width, height } = useTerminalSize(size);
  const [stack, setStack] = useState<readonly Route[]>([initialRoute]);
  const [lastSerial, setLastSerial] = useState<string | undefined>(undefined);
  // What the screen last said, read by the quit key at once: a screen tells the app in the same key
  // event that opens an editor, before React renders, so a `q` right behind it is never taken for quit.
  const [, setDirty, dirtyRef] = useLiveState(false);
  const [, setTyping, typingRef] = useLiveState(false);
  const [isConfirming, setConfirming] = useState(false);
  const route = stack[stack.length - 1] ?? { screen: 'bench' };

  const push = useCallback(
    (next: Route) => {
      if ('serial' in next) setLastSerial(next.serial);
      setDirty(false);
      setTyping(false);
      setStack((s) => [...s, next]);
    },
    [setDirty, setTyping],
  );
  // The editor has the keyboard throughout (its own q and Esc leave it, asking first when a change is unsaved).
  const openEditor = useCallback(
    (planHash: string) => {
      push({ screen: 'plan-editor', planHash });
      setTyping(true);
    },
    [push, setTyping],
  );
  /** Back from the editor; a saved plan takes the place of the one the plan screen showed. */
  const editorDone = useCallback(
    (from: string, saved: Plan | null) => {
      setTyping(false);
      setStack((s) => s.slice(0, -1).map((r) => (saved && r.screen === 'plan' && r.planHash === from ? { screen: 'plan', planHash: saved.hash } : r)));
    },
    [setTyping],
  );
  const back = useCallback(() => {
    setDirty(false);
    setTyping(false);
    setStack((s) => (s.length > 1 ? s.slice(0, -1) : s));
  }, [setDirty, setTyping]);

  // The only global key, off while an editor has the keyboard. That is asked per key, not through
  // `isActive`: a listener is attached or dropped only after the next render, so a `q` right after
  // an editor opens (or closes) would reach the wrong one.
  useInput(
    (input) => {
      if (input !== 'q' || typingRef.current) return;
      if (dirtyRef.current) setConfirming(true);
      else exit();
    },
    { isActive: !isConfirming },
  );

  const isActive = !isConfirming;
  const common = { log, width, height: isConfirming ? Math.max(5, height - 5) : height, isActive, onExit: back };
  const go = {
    onOpenRun: (serial: string, planHash: string, resumeRun?: string) => push({ screen: 'bring-up', serial, planHash, ...(resumeRun ? { resumeRun } : {}) }),
    onHistory: (serial: string) => push({ screen: 'history', serial }),
    onBatch: () => push({ screen: 'batch' }),
    onPlan: (planHash: string) => push({ screen: 'plan', planHash }),
  };

  let screen;
  switch (route.screen) {
    case 'bench':
      screen = (
        <BenchScreen
          {...common}
          catalog={catalog}
          go={go}
          onTypingChange={setTyping}
          onSelect={setLastSerial}
          {...(lastSerial ? { initialSerial: lastSerial } : {})}
        />
      );
      break;
    case 'bring-up':
      screen = (
        <WithTargets catalog={catalog} planHash={route.planHash} onExit={back} isActive={isActive}>
          {(plan, targets) => (
            <BringUpScreen
              {...common}
              plan={plan}
              targets={targets}
              serial={route.serial}
              operator={operator}
              instruments={instruments}
              onDirtyChange={setDirty}
              onTypingChange={setTyping}
              {...(route.resumeRun ? { resumeRun: route.resumeRun } : {})}
            />
          )}
        </WithTargets>
      );
      break;
    case 'history':
      screen = <HistoryScreen {...common} serial={route.serial} targetsCache={catalog.targetsCache} onTypingChange={setTyping} />;
      break;
    case 'batch':
      screen = (
        <BatchScreen {...common} targetsCache={catalog.targetsCache} onTypingChange={setTyping} onOpenBoard={(serial) => push({ screen: 'history', serial })} />
      );
      break;
    case 'plan':
      screen = (
        <WithTargets catalog={catalog} planHash={route.planHash} onExit={back} isActive={isActive}>
          {(plan, targets) => <PlanScreen {...common} plan={plan} targets={targets} {...(planEditing ? { onEdit: () => openEditor(route.planHash) } : {})} />}
        </WithTargets>
      );
      break;
    case 'plan-editor':
      screen = planEditing ? (
        <PlanEditorScreen
          key={route.planHash}
          catalog={catalog}
          planHash={route.planHash}
          access={planEditing}
          width={width}
          height={common.height}
          isActive={isActive}
          onDone={(saved) => editorDone(route.planHash, saved)}
        />
      ) : null;
      break;
  }
  return (
    <Box flexDirection="column" width={width}>
      {screen}
      {isConfirming ? <ConfirmQuit reason="A reading or a rework note is half typed" onQuit={() => exit()} onStay={() => setConfirming(false)} /> : null}
    </Box>
  );
}
