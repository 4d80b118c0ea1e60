import { useEffect, useReducer } from 'react';
import type { TargetsCache } from '../../log/targets-cache.js';
import type { BenchLog } from '../../log/types.js';
import { catalogBandSource } from '../batch/catalog-bands.js';
import { memoryTargetsCache } from '../batch/plan-bands.js';
import { PlanCatalog } from '../bench/plan-catalog.js';
import { loadHistory, type HistoryData } from './load-history.js';

export type HistoryPanel = 'timeline' | 'rework';
export type HistoryView = 'list' | 'target' | 'capture';

export interface HistoryState {
  readonly status: 'loading' | 'ready' | 'missing' | 'error';
  readonly message: string;
  readonly data: HistoryData | null;
  readonly panel: HistoryPanel;
  /** Selected timeline row. */
  readonly selected: number;
  /** Selected rework note. */
  readonly reworkSelected: number;
  readonly view: HistoryView;
  readonly isHelpOpen: boolean;
  /** While loading: the targets being computed (`computing the targets of exciter-b… 40 %`), or null. */
  readonly progress: string | null;
}

export type HistoryAction =
  | { readonly type: 'loaded'; readonly data: HistoryData | null }
  | { readonly type: 'targets-progress'; readonly plan: string; readonly done: number; readonly total: number }
  | { readonly type: 'failed'; readonly message: string }
  | { readonly type: 'move'; readonly delta: number }
  | { readonly type: 'open' }
  | { readonly type: 'draw-capture' }
  | { readonly type: 'back' }
  | { readonly type: 'tab' }
  | { readonly type: 'toggle-help' };

export const initialHistoryState: HistoryState = {
  status: 'loading',
  message: '',
  data: null,
  panel: 'timeline',
  selected: 0,
  reworkSelected: 0,
  view: 'list',
  isHelpOpen: false,
  progress: null,
};

const clamp = (i: number, n: number) => Math.max(0, Math.min(Math.max(0, n - 1), i));

/** The selected timeline entry, if any. */
export function selectedEntry(state: HistoryState) {
  return state.data?.timeline[state.selected];
}

/** The history screen as a pure reducer: impossible moves return the same state. */
export function historyReducer(state: HistoryState, action: HistoryAction): HistoryState {
  switch (action.type) {
    case 'loaded':
      return action.data
        ? { ...state, status: 'ready', data: action.data, selected: clamp(state.selected, action.data.timeline.length) }
        : { ...state, status: 'missing', data: null };
    case 'failed':
      return { ...state, status: 'error', message: action.message };
    case 'targets-progress':
      return state.status === 'loading'
        ? { ...state, progress: `computing the targets of ${action.plan}… ${Math.min(100, Math.round((100 * action.done) / Math.max(1, action.total)))} %` }
        : state;
    case 'move': {
      if (!state.data || state.view !== 'list') return state;
      if (state.panel === 'timeline') {
        const selected = clamp(state.selected + action.delta, state.data.timeline.length);
        return selected === state.selected ? state : { ...state, selected };
      }
      const reworkSelected = clamp(state.reworkSelected + action.delta, state.data.board.rework.length);
      return reworkSelected === state.reworkSelected ? state : { ...state, reworkSelected };
    }
    case 'open': {
      if (state.view !== 'list' || state.panel !== 'timeline') return state;
      const entry = selectedEntry(state);
      if (!entry) return state;
      if (entry.kind === 'reading') return { ...state, view: 'target' };
      if (entry.kind === 'capture') return { ...state, view: 'capture' };
      if (entry.kind === 'rework') {
        const at = state.data?.board.rework.findIndex((r) => r.id === entry.rework.id) ?? -1;
        return { ...state, panel: 'rework', reworkSelected: Math.max(0, at) };
      }
      return state;
    }
    case 'draw-capture': {
      const entry = selectedEntry(state);
      return state.view === 'target' && entry?.kind === 'reading' && entry.reading.capture ? { ...state, view: 'capture' } : state;
    }
    case 'back':
      if (state.isHelpOpen) return { ...state, isHelpOpen: false };
      if (state.view !== 'list') return { ...state, view: 'list' };
      return state;
    case 'tab':
      if (state.view !== 'list') return state;
      return { ...state, panel: state.panel === 'timeline' ? 'rework' : 'timeline' };
    case 'toggle-help':
      return { ...state, isHelpOpen: !state.isHelpOpen };
  }
}

/**
 * The history of one board, loaded from the log once per serial; the bands of
 * its plan revisions come as the batch screen's do (the catalog: the cache,
 * else the targets worker, with progress).
 */
export function useHistoryState(log: BenchLog, serial: string, catalog?: PlanCatalog, targetsCache?: TargetsCache) {
  const [state, dispatch] = useReducer(historyReducer, initialHistoryState);
  useEffect(() => {
    let isCurrent = true;
    const plans = catalog ?? new PlanCatalog(log, [], { targetsCache: targetsCache ?? memoryTargetsCache() });
    const bands = catalogBandSource(log, plans, (plan, done, total) => isCurrent && dispatch({ type: 'targets-progress', plan, done, total }));
    loadHistory(log, serial, bands).then(
      (data) => isCurrent && dispatch({ type: 'loaded', data }),
      (error: unknown) => isCurrent && dispatch({ type: 'failed', message: error instanceof Error ? error.message : String(error) }),
    );
    return () => {
      isCurrent = false;
    };
  }, [log, serial, catalog, targetsCache]);
  return { state, dispatch };
}
