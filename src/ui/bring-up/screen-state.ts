import { moveSelection } from '../components/scroll-window.js';

/** Which control of the bring-up screen has the keyboard. */
export type Focus = 'input' | 'list' | 'rework' | 'end' | 'help' | 'capture';

/** The fields of a rework note. */
export interface ReworkFields {
  readonly part: string;
  readonly from: string;
  readonly to: string;
  readonly note: string;
}

export const reworkFieldNames = ['part', 'from', 'to', 'note'] as const;
export type ReworkField = (typeof reworkFieldNames)[number];

export const emptyRework: ReworkFields = { part: '', from: '', to: '', note: '' };

/** The screen's own state, beside the run: where the keys go, the list and end-panel cursors, the rework form. */
export interface ScreenState {
  readonly focus: Focus;
  /** The control the help was opened from, which it goes back to. */
  readonly helpFrom: Exclude<Focus, 'help'>;
  /** Row of the stage list under the cursor. */
  readonly listCursor: number;
  /** Row of the end-of-run panel under the cursor. */
  readonly endCursor: number;
  readonly rework: {
    readonly fields: ReworkFields;
    readonly field: ReworkField;
    readonly error: string | null;
    readonly isSaving: boolean;
  };
}

export type ScreenAction =
  | { readonly type: 'focus'; readonly focus: Focus }
  | { readonly type: 'toggle-help' }
  | { readonly type: 'move-list'; readonly delta: number; readonly count: number }
  | { readonly type: 'set-list'; readonly row: number }
  | { readonly type: 'open-end' }
  | { readonly type: 'move-end'; readonly delta: number; readonly count: number }
  | { readonly type: 'open-rework'; readonly fields: ReworkFields }
  | { readonly type: 'edit-rework'; readonly text: string }
  | { readonly type: 'move-rework'; readonly delta: number }
  | { readonly type: 'rework-saving' }
  | { readonly type: 'rework-saved'; readonly error: string | null };

export const initialScreenState: ScreenState = {
  focus: 'input',
  helpFrom: 'input',
  listCursor: 0,
  endCursor: 0,
  rework: { fields: emptyRework, field: 'part', error: null, isSaving: false },
};

/** Whether the focused control takes letters as text, so the app's `q` must not quit. */
export const isTypingFocus = (focus: Focus): boolean => focus === 'rework' || focus === 'capture';

/** The screen state after one action; the same state for a move that changes nothing or is not allowed now. */
export function screenReducer(state: ScreenState, action: ScreenAction): ScreenState {
  const { rework } = state;
  switch (action.type) {
    case 'focus':
      // While a rework note is being saved it keeps the keyboard.
      if (rework.isSaving || state.focus === action.focus) return state;
      return { ...state, focus: action.focus };
    case 'toggle-help':
      if (rework.isSaving) return state;
      return state.focus === 'help' ? { ...state, focus: state.helpFrom } : { ...state, focus: 'help', helpFrom: state.focus };
    case 'move-list': {
      const row = moveSelection(state.listCursor, action.delta, action.count);
      return row === state.listCursor ? state : { ...state, listCursor: row };
    }
    case 'set-list':
      return action.row === state.listCursor || action.row < 0 ? state : { ...state, listCursor: action.row };
    case 'open-end':
      return { ...state, focus: 'end', endCursor: 0 };
    case 'move-end': {
      if (state.focus !== 'end') return state;
      const row = moveSelection(state.endCursor, action.delta, action.count);
      return row === state.endCursor ? state : { ...state, endCursor: row };
    }
    case 'open-rework':
      return { ...state, focus: 'rework', rework: { fields: action.fields, field: 'part', error: null, isSaving: false } };
    case 'edit-rework':
      if (state.focus !== 'rework' || rework.isSaving || rework.fields[rework.field] === action.text) return state;
      return { ...state, rework: { ...rework, fields: { ...rework.fields, [rework.field]: action.text } } };
    case 'move-rework': {
      if (state.focus !== 'rework' || rework.isSaving) return state;
      const at = reworkFieldNames.indexOf(rework.field);
      const field = reworkFieldNames[Math.max(0, Math.min(reworkFieldNames.length - 1, at + action.delta))] ?? rework.field;
      return field === rework.field ? state : { ...state, rework: { ...rework, field } };
    }
    case 'rework-saving':
      return state.focus !== 'rework' || rework.isSaving ? state : { ...state, rework: { ...rework, isSaving: true, error: null } };
    case 'rework-saved':
      if (!rework.isSaving) return state;
      return { ...state, focus: action.error ? state.focus : 'input', rework: { ...rework, isSaving: false, error: action.error } };
  }
}
