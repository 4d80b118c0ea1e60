import { useEffect, useMemo, useReducer, useRef } from 'react';
import type { LogIndex } from '../../log/types.js';
import type { LogStore } from '../../log/store.js';
import type { BenchLog } from '../../log/types.js';
import { weakestFirst } from '../../review/batch.js';
import type { BatchCheck, BatchFigures } from '../../review/batch-types.js';
import type { BatchFilter } from '../../review/filter.js';
import type { TargetsCache } from '../../log/targets-cache.js';
import { PlanCatalog } from '../bench/plan-catalog.js';
import { catalogBandSource } from './catalog-bands.js';
import { memoryTargetsCache } from './plan-bands.js';
import { scanBatch } from './scan-batch.js';
import { applyForm, formFromFilter, type FilterForm } from './filter-form-state.js';

export type BatchPanel = 'histogram' | 'trend' | 'outliers';
export const batchPanels: readonly BatchPanel[] = ['histogram', 'trend', 'outliers'];

export interface BatchState {
  readonly status: 'loading' | 'scanning' | 'ready' | 'error';
  readonly message: string;
  /** How far the current step got: counted (boards) or in percent (a plan's targets). */
  readonly progress: { readonly done: number; readonly total: number; readonly what: string; readonly isPercent: boolean } | null;
  readonly figures: BatchFigures | null;
  /** Checks weakest first, as shown. */
  readonly rows: readonly BatchCheck[];
  readonly selected: number;
  readonly panel: BatchPanel;
  readonly outlierSelected: number;
  readonly isHelpOpen: boolean;
  readonly filter: BatchFilter;
  /** The filter being edited (`f`), or null. */
  readonly form: FilterForm | null;
}

export type BatchAction =
  | { readonly type: 'progress'; readonly done: number; readonly total: number; readonly what: string }
  /** The targets of a plan revision being computed (Monte Carlo trials done of total). */
  | { readonly type: 'targets-progress'; readonly plan: string; readonly done: number; readonly total: number }
  | { readonly type: 'scanning' }
  | { readonly type: 'figures'; readonly figures: BatchFigures }
  | { readonly type: 'failed'; readonly message: string }
  | { readonly type: 'move'; readonly delta: number }
  | { readonly type: 'tab'; readonly delta: number }
  | { readonly type: 'open' }
  | { readonly type: 'toggle-help' }
  | { readonly type: 'back' }
  | { readonly type: 'form-open' }
  | { readonly type: 'form-edit'; readonly form: FilterForm }
  | { readonly type: 'form-apply' };

export const initialBatchState: BatchState = {
  status: 'loading',
  message: '',
  progress: null,
  figures: null,
  rows: [],
  selected: 0,
  panel: 'histogram',
  outlierSelected: 0,
  isHelpOpen: false,
  filter: {},
  form: null,
};

const clamp = (i: number, n: number) => Math.max(0, Math.min(Math.max(0, n - 1), i));

/** The check under the cursor. */
export function selectedCheck(state: BatchState): BatchCheck | undefined {
  return state.rows[state.selected];
}

/** The batch screen as a pure reducer. */
export function batchReducer(state: BatchState, action: BatchAction): BatchState {
  switch (action.type) {
    case 'progress':
      return { ...state, progress: { done: action.done, total: action.total, what: action.what, isPercent: false } };
    case 'targets-progress':
      return { ...state, progress: { done: action.done, total: action.total, what: `computing the targets of ${action.plan}`, isPercent: true } };
    case 'scanning':
      return { ...state, status: 'scanning', progress: null };
    case 'figures': {
      const rows = [...action.figures.checks].sort(weakestFirst);
      // The check selected before the rescan stays selected when it is still listed.
      const stillSelected = rows.findIndex((c) => c.check === selectedCheck(state)?.check && c.plan === selectedCheck(state)?.plan);
      return { ...state, status: 'ready', progress: null, figures: action.figures, rows, selected: stillSelected >= 0 ? stillSelected : 0, outlierSelected: 0 };
    }
    case 'failed':
      return { ...state, status: 'error', message: action.message };
    case 'move': {
      if (state.form || state.isHelpOpen) return state;
      if (state.panel === 'outliers') {
        const n = selectedCheck(state)?.outliers.length ?? 0;
        return { ...state, outlierSelected: clamp(state.outlierSelected + action.delta, n) };
      }
      const selected = clamp(state.selected + action.delta, state.rows.length);
      return selected === state.selected ? state : { ...state, selected, outlierSelected: 0 };
    }
    case 'tab': {
      if (state.form || state.isHelpOpen) return state;
      const i = batchPanels.indexOf(state.panel);
      const panel = batchPanels[(i + action.delta + batchPanels.length) % batchPanels.length] ?? 'histogram';
      return { ...state, panel };
    }
    case 'open':
      // Enter on a check goes to its outliers; the outlier itself is opened by the keys hook.
      return state.panel !== 'outliers' && selectedCheck(state) ? { ...state, panel: 'outliers', outlierSelected: 0 } : state;
    case 'toggle-help':
      return state.form ? state : { ...state, isHelpOpen: !state.isHelpOpen };
    case 'back':
      if (state.isHelpOpen) return { ...state, isHelpOpen: false };
      if (state.form) return { ...state, form: null };
      if (state.panel === 'outliers') return { ...state, panel: 'histogram' };
      return state;
    case 'form-open':
      return state.isHelpOpen ? state : { ...state, form: formFromFilter(state.filter) };
    case 'form-edit':
      return state.form ? { ...state, form: action.form } : state;
    case 'form-apply': {
      if (!state.form) return state;
      const result = applyForm(state.form);
      if (!result.ok) return { ...state, form: { ...state.form, error: result.message } };
      return { ...state, form: null, filter: result.filter };
    }
  }
}

/**
 * Load the index once, then rescan the in-memory index whenever the filter
 * changes. The bands come through the app's plan catalog (the targets worker
 * and the one targets cache); without one, a catalog of the log's snapshots
 * over `targetsCache`.
 */
export function useBatchState(log: BenchLog, catalog?: PlanCatalog, targetsCache?: TargetsCache) {
  const [state, dispatch] = useReducer(batchReducer, initialBatchState);
  const bands = useMemo(() => {
    const plans = catalog ?? new PlanCatalog(log, [], { targetsCache: targetsCache ?? memoryTargetsCache() });
    return catalogBandSource(log, plans, (plan, done, total) => dispatch({ type: 'targets-progress', plan, done, total }));
  }, [log, catalog, targetsCache]);
  const index = useRef<LogIndex | null>(null);
  const [loaded, markLoaded] = useReducer((n: number) => n + 1, 0);
  useEffect(() => {
    let isCurrent = true;
    const read = (log as Partial<LogStore>).readIndex;
    const progress = (done: number, total: number) => isCurrent && dispatch({ type: 'progress', done, total, what: 'reading board files for the index' });
    // Every board file's stamp is checked: a batch never counts a board from a summary its file no longer backs.
    (read ? (log as LogStore).readIndex(progress, { verify: true }) : log.readIndex()).then(
      (value) => {
        if (!isCurrent) return;
        index.current = value;
        markLoaded();
      },
      (error: unknown) => isCurrent && dispatch({ type: 'failed', message: error instanceof Error ? error.message : String(error) }),
    );
    return () => {
      isCurrent = false;
    };
  }, [log]);
  useEffect(() => {
    const current = index.current;
    if (!current) return;
    let isCurrent = true;
    dispatch({ type: 'scanning' });
    scanBatch(
      current,
      bands,
      state.filter,
      (done, total) => isCurrent && dispatch({ type: 'progress', done, total, what: 'scanning boards' }),
      () => !isCurrent,
    ).then(
      (figures) => isCurrent && figures && dispatch({ type: 'figures', figures }),
      (error: unknown) => isCurrent && dispatch({ type: 'failed', message: error instanceof Error ? error.message : String(error) }),
    );
    return () => {
      isCurrent = false;
    };
  }, [loaded, bands, state.filter]);
  return { state, dispatch };
}
