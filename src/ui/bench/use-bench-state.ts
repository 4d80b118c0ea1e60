import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type { BenchLog, BoardHead, BoardSummary, LogIndex } from '../../log/types.js';
import { validateSerial } from '../../log/serial.js';
import type { Plan } from '../../plan/types.js';
import { moveSelection } from '../components/scroll-window.js';
import { filterBoards, orderBoards } from './board-order.js';
import type { PlanCatalog, PlanChoice } from './plan-catalog.js';

/** What the bench screen is doing: listing, or one of its small dialogs. */
/** Every mode but help: where help goes back to. */
export type DialogMode = Exclude<BenchMode, { readonly kind: 'help' }>;

export type BenchMode =
  | { readonly kind: 'list' }
  | { readonly kind: 'filter' }
  | { readonly kind: 'new-serial' }
  | { readonly kind: 'choose-plan'; readonly serial: string; readonly choices: readonly PlanChoice[]; readonly selected: number }
  | { readonly kind: 'confirm-run'; readonly board: BoardHead; readonly plan: Plan }
  /** The help of the screen, or of the dialog it was opened from (`from`), which it goes back to. */
  | { readonly kind: 'help'; readonly from: DialogMode }
  | { readonly kind: 'busy'; readonly what: string };

/** Where the bench screen sends the technician; the app switches screens. */
export interface BenchTargets {
  readonly onOpenRun: (serial: string, planHash: string, resumeRun?: string) => void;
  readonly onHistory: (serial: string) => void;
  readonly onBatch: () => void;
  readonly onPlan: (planHash: string) => void;
}

export interface Message {
  readonly text: string;
  readonly tone: 'info' | 'error';
}

/** Boards read from the top of the index before the whole of it: more than a tall terminal shows. */
const firstRows = 200;

/**
 * The bench screen's state: the boards from the index, the selection, the dialogs.
 * The first frame lists the index's first boards by latest activity (`readIndexHead`),
 * then the whole index replaces them, the selected board kept.
 */
export function useBenchState(
  log: BenchLog,
  catalog: PlanCatalog | Promise<PlanCatalog>,
  go: BenchTargets,
  initialSerial?: string,
  onSelect?: (serial: string) => void,
) {
  const [index, setIndex] = useState<LogIndex | null>(null);
  /** The whole index's boards in the screen's order, sorted once when it arrives. */
  const [ordered, setOrdered] = useState<readonly BoardSummary[]>([]);
  // Read during the first render on purpose: a few kilobytes, so the first frame already lists boards.
  const [head] = useState(() => log.readIndexHead?.(firstRows) ?? null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [selected, setSelected] = useState(() => Math.max(0, head?.boards.findIndex((b) => b.serial === initialSerial) ?? 0));
  /** Whether the technician has moved the selection (then the whole index keeps that board selected). */
  const hasMoved = useRef(false);
  const selectedSerialRef = useRef<string | undefined>(undefined);
  const [filter, setFilter] = useState('');
  const [mode, setMode] = useState<BenchMode>({ kind: 'list' });
  const [message, setMessage] = useState<Message | null>(null);
  const mounted = useRef(true);
  useEffect(() => () => void (mounted.current = false), []);

  // The board to select on arrival is read once: the selection itself updates it later.
  const arrival = useRef(initialSerial);
  /** The whole index as it is being read (what a new serial is looked up in). */
  const wholeIndex = useRef<Promise<LogIndex> | null>(null);
  const [progress, setProgress] = useState<{ done: number; total: number } | null>(null);
  useEffect(() => {
    // The store reports progress while it rebuilds a stale index (thousands of
    // boards); the BenchLog interface leaves the callback out, so pass it loosely:
    // a log that takes no callback ignores it.
    const readIndex = log.readIndex as (onProgress?: (done: number, total: number) => void) => Promise<LogIndex>;
    const reading = readIndex.call(log, (done, total) => mounted.current && setProgress({ done, total }));
    wholeIndex.current = reading;
    reading.then(
      (ix) => {
        if (!mounted.current) return;
        const boards = orderBoards(Object.values(ix.boards));
        setIndex(ix);
        setOrdered(boards);
        const serial = hasMoved.current ? selectedSerialRef.current : arrival.current;
        if (serial) {
          const at = boards.findIndex((b) => b.serial === serial);
          if (at >= 0) setSelected(at);
        }
      },
      (error: unknown) => mounted.current && setLoadError(error instanceof Error ? error.message : String(error)),
    );
  }, [log]);

  const all: readonly BoardHead[] = index ? ordered : (head?.boards ?? []);
  const boards = useMemo(() => filterBoards(all, filter), [all, filter]);
  const current: BoardHead | undefined = boards[Math.min(selected, boards.length - 1)];
  const selectedSerial = current?.serial;
  selectedSerialRef.current = selectedSerial;
  const selectRef = useRef(onSelect);
  selectRef.current = onSelect;
  useEffect(() => {
    if (selectedSerial) selectRef.current?.(selectedSerial);
  }, [selectedSerial]);

  const fail = (error: unknown) => {
    if (!mounted.current) return;
    setMode({ kind: 'list' });
    setMessage({ text: error instanceof Error ? error.message : String(error), tone: 'error' });
  };

  const noPlan = (serial: string) => `no plan for ${serial}: its plan is neither given with --plan nor kept in the log; restart with --plan FILE`;

  /** Enter on a board: resume its unfinished run, else offer a new run with its plan. */
  const openSelected = useCallback(() => {
    const board = current;
    if (!board) return;
    setMode({ kind: 'busy', what: `opening ${board.serial}…` });
    void (async () => {
      const file = await log.readBoard(board.serial);
      const open = file ? [...file.runs].reverse().find((r) => r.ended === null && r.outcome === 'in-progress') : undefined;
      if (open) {
        setMode({ kind: 'list' });
        go.onOpenRun(board.serial, open.planHash, open.id);
        return;
      }
      const plan = await (await catalog).forBoard(board);
      if (!mounted.current) return;
      if (!plan) {
        setMode({ kind: 'list' });
        setMessage({ text: noPlan(board.serial), tone: 'error' });
        return;
      }
      setMode({ kind: 'confirm-run', board, plan });
    })().catch(fail);
  }, [current, log, catalog, go]);

  const submitSerial = useCallback(
    (text: string) => {
      const serial = text.trim();
      const problem = validateSerial(serial);
      if (problem) {
        setMessage({ text: problem, tone: 'error' });
        return;
      }
      setMessage(null);
      void (async () => {
        // Until the whole index is in, a serial missing from the first boards may still be in the log: wait for it.
        let ix = index;
        if (ix === null) {
          setMode({ kind: 'busy', what: 'reading the log index…' });
          ix = await (wholeIndex.current ?? log.readIndex());
          if (!mounted.current) return;
        }
        if (Object.hasOwn(ix.boards, serial)) {
          const existing = orderBoards(Object.values(ix.boards)).findIndex((b) => b.serial === serial);
          setFilter('');
          setSelected(existing);
          setMode({ kind: 'list' });
          setMessage({ text: `${serial} is already in the log: selected it; Enter opens it`, tone: 'info' });
          return;
        }
        setMode({ kind: 'busy', what: 'looking up plans…' });
        const choices = await (await catalog).choices(ix);
        if (!mounted.current) return;
        const only = choices[0];
        if (choices.length === 0) {
          setMode({ kind: 'list' });
          setMessage({ text: 'no plan to choose from: start probebook with --plan FILE', tone: 'error' });
        } else if (choices.length === 1 && only) {
          setMode({ kind: 'list' });
          go.onOpenRun(serial, only.plan.hash);
        } else {
          setMode({ kind: 'choose-plan', serial, choices, selected: 0 });
        }
      })().catch(fail);
    },
    [index, log, catalog, go],
  );

  const choosePlan = useCallback(() => {
    if (mode.kind !== 'choose-plan') return;
    const choice = mode.choices[mode.selected];
    if (!choice) return;
    setMode({ kind: 'list' });
    go.onOpenRun(mode.serial, choice.plan.hash);
  }, [mode, go]);

  const movePlanChoice = useCallback((delta: number) => {
    setMode((m) => (m.kind === 'choose-plan' ? { ...m, selected: Math.max(0, Math.min(m.choices.length - 1, m.selected + delta)) } : m));
  }, []);

  const confirmRun = useCallback(() => {
    if (mode.kind !== 'confirm-run') return;
    setMode({ kind: 'list' });
    go.onOpenRun(mode.board.serial, mode.plan.hash);
  }, [mode, go]);

  const openPlan = useCallback(() => {
    setMessage(null);
    void (async () => {
      const plans = await catalog;
      const plan = current ? await plans.forBoard(current) : (plans.filePlans[0] ?? null);
      if (!mounted.current) return;
      if (plan) go.onPlan(plan.hash);
      else setMessage({ text: current ? noPlan(current.serial) : 'no plan to show: start probebook with --plan FILE', tone: 'error' });
    })().catch(fail);
  }, [current, catalog, go]);

  const openHistory = useCallback(() => {
    if (current) go.onHistory(current.serial);
    else setMessage({ text: 'no board selected: press n to enter a new board', tone: 'info' });
  }, [current, go]);

  return {
    isLoading: index === null && loadError === null,
    /** Boards re-read so far while the index is rebuilt, or null. */
    progress,
    /** Board files the log could not read, with the store's message for each. */
    damaged: index?.damaged ?? [],
    loadError,
    total: all.length,
    boards,
    selected: Math.max(0, Math.min(selected, boards.length - 1)),
    current,
    filter,
    mode,
    message,
    setSelected: (at: number) => {
      hasMoved.current = true;
      setSelected(at);
    },
    /** Move the selection; functional, so several keys in one chunk all count. */
    moveBy: (delta: number) => {
      hasMoved.current = true;
      setSelected((s) => moveSelection(Math.min(s, boards.length - 1), delta, boards.length));
    },
    setFilter: (text: string) => {
      setFilter(text);
      setSelected(0);
    },
    setMode,
    setMessage,
    openSelected,
    submitSerial,
    choosePlan,
    movePlanChoice,
    confirmRun,
    openPlan,
    openHistory,
    openBatch: go.onBatch,
  };
}

export type BenchState = ReturnType<typeof useBenchState>;
