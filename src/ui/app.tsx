import { Suspense, useCallback, useEffect, useRef, useState } from 'react';
import { Box, Text, useApp, useInput } from 'ink';
import type { BenchLog } from '../log/types.js';
import type { InstrumentSource } from '../bench/source.js';
import type { Plan } from '../plan/types.js';
import { BenchScreen } from './bench/bench.js';
import type { PlanCatalog } from './bench/plan-catalog.js';
import { ConfirmQuit } from './components/confirm-quit.js';
import { useLiveState } from './components/use-live-state.js';
import { useSettled } from './components/use-settled.js';
import { type Size, useTerminalSize } from './components/use-terminal-size.js';
import { WithTargets } from './components/with-targets.js';
import type { PlanEditAccess } from './plan-editor/plan-edit-access.js';
import { BatchScreen, BringUpScreen, HistoryScreen, PlanEditorScreen, PlanScreen } from './screens.js';
import { toneProps } from './theme.js';

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
  /** The plans; a promise while they load (the TUI loads them after its first frame, the bench screen needs none to list boards). */
  readonly catalog: PlanCatalog | Promise<PlanCatalog>;
  readonly operator: string;
  /** A fixed size instead of the terminal's (tests, benchmarks). */
  readonly size?: Partial<Size>;
  /** Where to start. @default bench */
  readonly initialRoute?: Route;
  /** Called instead of Ink's exit when the technician quits (tests). */
  readonly onQuit?: () => void;
  /** The bench's instruments, for the bring-up screen's `m` key (a promise while they load). @default null */
  readonly instruments?: InstrumentSource | null | Promise<InstrumentSource | null>;
  /**
   * How the plan screen's `e` opens and saves a plan in the editor (the CLI gives it, a promise
   * while it loads); none: no `e`. @default null
   */
  readonly planEditing?: PlanEditAccess | null | Promise<PlanEditAccess | null>;
  /** Called once, when the first screen shows what it opened for (the bench screen: its boards). */
  readonly onShown?: () => void;
}

/** Switches screens and owns the quit dialog; every screen keeps its own state. */
export function App({ log, catalog, operator, size, initialRoute = { screen: 'bench' }, onQuit, instruments = null, planEditing = null, onShown }: AppProps) {
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
  const plans = useSettled(catalog);
  const bench = useSettled(instruments);
  const editing = useSettled(planEditing);
  const shown = useRef(false);
  const onBenchShown = useCallback(() => {
    if (shown.current) return;
    shown.current = true;
    onShown?.();
  }, [onShown]);
  // biome-ignore lint/correctness/useExhaustiveDependencies: said once, for the screen the app opened on
  useEffect(() => {
    if (initialRoute.screen !== 'bench') onBenchShown();
  }, []);

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

  // Every screen but the bench's needs the plans (and the bring-up screen the instruments): until they are in, a line says so.
  const ready =
    plans.state === 'ready' && bench.state !== 'pending' && editing.state !== 'pending'
      ? { catalog: plans.value, instruments: bench.state === 'ready' ? bench.value : null, planEditing: editing.state === 'ready' ? editing.value : null }
      : null;
  let screen;
  if (route.screen === 'bench') {
    screen = (
      <BenchScreen
        {...common}
        catalog={catalog}
        go={go}
        onTypingChange={setTyping}
        onSelect={setLastSerial}
        onLoaded={onBenchShown}
        {...(lastSerial ? { initialSerial: lastSerial } : {})}
      />
    );
  } else if (!ready) {
    screen = <Waiting what={plans.state === 'failed' ? plans.message : null} onExit={back} isActive={isActive} />;
  } else if (route.screen === 'bring-up') {
    screen = (
      <WithTargets catalog={ready.catalog} planHash={route.planHash} onExit={back} isActive={isActive}>
        {(plan, targets) => (
          <BringUpScreen
            {...common}
            plan={plan}
            targets={targets}
            serial={route.serial}
            operator={operator}
            instruments={ready.instruments}
            onDirtyChange={setDirty}
            onTypingChange={setTyping}
            {...(route.resumeRun ? { resumeRun: route.resumeRun } : {})}
          />
        )}
      </WithTargets>
    );
  } else if (route.screen === 'history') {
    screen = <HistoryScreen {...common} serial={route.serial} catalog={ready.catalog} onTypingChange={setTyping} />;
  } else if (route.screen === 'batch') {
    screen = <BatchScreen {...common} catalog={ready.catalog} onTypingChange={setTyping} onOpenBoard={(serial) => push({ screen: 'history', serial })} />;
  } else if (route.screen === 'plan') {
    const { planEditing: access } = ready;
    screen = (
      <WithTargets catalog={ready.catalog} planHash={route.planHash} onExit={back} isActive={isActive}>
        {(plan, targets) => <PlanScreen {...common} plan={plan} targets={targets} {...(access ? { onEdit: () => openEditor(route.planHash) } : {})} />}
      </WithTargets>
    );
  } else {
    screen = ready.planEditing ? (
      <PlanEditorScreen
        key={route.planHash}
        catalog={ready.catalog}
        planHash={route.planHash}
        access={ready.planEditing}
        width={width}
        height={common.height}
        isActive={isActive}
        onDone={(saved) => editorDone(route.planHash, saved)}
      />
    ) : null;
  }
  return (
    <Box flexDirection="column" width={width}>
      <Suspense fallback={<Text>opening the {route.screen} screen…</Text>}>{screen}</Suspense>
      {isConfirming ? <ConfirmQuit reason="A reading or a rework note is half typed" onQuit={() => exit()} onStay={() => setConfirming(false)} /> : null}
    </Box>
  );
}

/** A screen that needs the plans, opened while they load (or after they failed to). */
function Waiting({ what, onExit, isActive }: { readonly what: string | null; readonly onExit: () => void; readonly isActive: boolean }) {
  useInput((_input, key) => key.escape && onExit(), { isActive });
  return (
    <Box flexDirection="column">
      {what === null ? <Text>loading the plans…</Text> : <Text {...toneProps('bad')}>✗ {what}</Text>}
      <Text {...toneProps('dim')}>Esc back</Text>
    </Box>
  );
}
