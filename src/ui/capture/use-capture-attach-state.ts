import { useCallback, useEffect, useRef } from 'react';
import { useLiveState } from '../components/use-live-state.js';
import { type AnalyzedCapture, analyzeCaptureFile } from '../../signal/analyze-capture.js';
import { CaptureError } from '../../signal/types.js';
import { completePath, expandPath } from './path-complete.js';
import { parseEntry } from './entry.js';

/** Where the attach box is: typing a path, reading the file, showing the figures. */
export type AttachPhase =
  | { readonly kind: 'path' }
  | { readonly kind: 'loading'; readonly path: string; readonly fraction: number }
  | { readonly kind: 'done'; readonly path: string; readonly analyzed: AnalyzedCapture };

export interface AttachState {
  readonly phase: AttachPhase;
  /** Names offered by the last Tab. */
  readonly candidates: readonly string[];
  /** A message for the path line (bad entry, unreadable file). */
  readonly message: string | null;
}

/** The attach box's state and its moves; reading runs in the background. */
export function useCaptureAttachState(cwd: string) {
  // `latest` is the state for key handlers: keys can arrive before the next render.
  const [state, setState, latest] = useLiveState<AttachState>({ phase: { kind: 'path' }, candidates: [], message: null });
  // Each read gets a number; a read that was cancelled (or outlived the box) is ignored.
  const readId = useRef(0);
  useEffect(() => () => void (readId.current += 1), []);

  /** The path was edited: the last completion's names and message no longer apply. */
  const edited = useCallback(
    () => setState((s) => (s.candidates.length === 0 && s.message === null ? s : { ...s, candidates: [], message: null })),
    [setState],
  );
  /** Complete the typed path (Tab); returns the completed text. */
  const complete = useCallback(
    (text: string): string => {
      const c = completePath(text, cwd);
      const message =
        c.matches === 0
          ? 'nothing there starts with that'
          : c.matches > c.candidates.length && c.candidates.length > 0
            ? `${c.matches} names fit; type more`
            : null;
      setState((s) => ({ ...s, candidates: c.candidates, message }));
      return c.text;
    },
    [cwd, setState],
  );
  const back = useCallback(() => {
    readId.current += 1;
    setState((s) => ({ ...s, phase: { kind: 'path' } }));
  }, [setState]);

  const load = useCallback(
    (text: string) => {
      const entry = parseEntry(text);
      if (!entry.ok) {
        setState((s) => ({ ...s, message: entry.message }));
        return;
      }
      const id = ++readId.current;
      const path = expandPath(entry.path, cwd);
      // `latest` follows at once: a key right after Enter (Esc: stop waiting) must find the new phase.
      setState((s) => ({ ...s, candidates: [], message: null, phase: { kind: 'loading', path, fraction: 0 } }));
      let shown = 0;
      analyzeCaptureFile(path, { ...entry.options, keepBytes: true, name: entry.path }, (fraction) => {
        // Redraw at whole percents only: a big file reports often.
        if (id !== readId.current || fraction - shown < 0.01) return;
        shown = fraction;
        setState((s) => (s.phase.kind === 'loading' ? { ...s, phase: { ...s.phase, fraction } } : s));
      }).then(
        (analyzed) => {
          if (id === readId.current) setState((s) => ({ ...s, phase: { kind: 'done', path, analyzed } }));
        },
        (error: unknown) => {
          if (id !== readId.current) return;
          const message = error instanceof CaptureError ? error.message : `could not read it: ${error instanceof Error ? error.message : String(error)}`;
          setState((s) => ({ ...s, phase: { kind: 'path' }, message }));
        },
      );
    },
    [cwd, setState],
  );
  return { state, latest, edited, complete, load, back };
}
