import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { alignPeriod } from '../../signal/align.js';
import { explainReading, hintsFor } from '../../analysis/explain.js';
import type { Target } from '../../analysis/types.js';
import type { RunOutcome } from '../../log/types.js';
import { assessReading } from '../../run/assess.js';
import { uncertaintyFor, verdictFor } from '../../analysis/verdict.js';
import type { InstrumentSource } from '../../bench/source.js';
import { captureCsv } from '../../bench/capture-csv.js';
import { measure as measureRecord } from '../../signal/measure.js';
import { createRunState } from '../../run/create.js';
import { lockReason } from '../../run/gates.js';
import { runReducer } from '../../run/reducer.js';
import type { EndOutcome, RunAction, RunState } from '../../run/types.js';
import { useLiveState } from '../components/use-live-state.js';
import type { BringUpProps } from '../screen-props.js';
import { captureReadings } from '../../run/capture-readings.js';
import { outputOf } from '../../plan/check-output.js';
import { captureWarnings } from '../../signal/capture-warnings.js';
import type { CaptureFigures } from './capture-slot.js';
import type { ReworkFields } from './screen-state.js';
import { toRunReading, toRunRework } from './to-run-records.js';

/** What the screen tells the technician about the latest action. */
export type Status =
  | { readonly kind: 'loading' }
  | { readonly kind: 'idle' }
  | { readonly kind: 'saving'; readonly text: string }
  | { readonly kind: 'measuring'; readonly instrument: string; readonly query: string; readonly since: number; readonly count: number; readonly of: number }
  | { readonly kind: 'saved'; readonly id: string }
  | { readonly kind: 'note'; readonly message: string }
  | { readonly kind: 'warning'; readonly message: string }
  | { readonly kind: 'rejected'; readonly message: string }
  | { readonly kind: 'error'; readonly message: string };

const message = (error: unknown): string => (error instanceof Error ? error.message : String(error));

/** Parts a rework can name: every toleranced part of the plan and every rail. */
export function knownParts(plan: BringUpProps['plan']): readonly string[] {
  return [...plan.rails.map((r) => `rails.${r.id}`), ...plan.stages.flatMap((s) => Object.keys(s.parts).map((role) => `${s.id}.${role}`))];
}

/**
 * The bring-up screen's state: the core run reducer, plus the log writes. The
 * run only ever hears of a reading after the log has it on disk, so whatever
 * the screen shows as recorded is saved. The run is started in the log at the
 * first write, so opening the screen and leaving leaves no empty run behind.
 */
export function useBringUpState({ plan, targets, serial, operator, log, resumeRun, instruments }: BringUpProps) {
  const [state, setState, stateRef] = useLiveState<RunState>(() => createRunState(plan, targets.targets));
  // The reducer is pure, so applying it here keeps `stateRef` current for keys that arrive before the next render.
  const dispatch = useCallback((action: RunAction) => setState((s) => runReducer(s, action)), [setState]);
  const [status, setStatus, statusRef] = useLiveState<Status>(resumeRun ? { kind: 'loading' } : { kind: 'idle' });
  const [runId, setRunId] = useState<string | null>(resumeRun ?? null);
  // Two periods of the latest capture at each output, drawn over the expected trace.
  const [captures, setCaptures] = useState<ReadonlyMap<string, Float64Array>>(new Map());
  const aligned = useRef(new Set<string>());
  const runRef = useRef<Promise<string> | null>(resumeRun ? Promise.resolve(resumeRun) : null);
  const busy = useRef(false);

  useEffect(() => {
    if (!resumeRun) return;
    let live = true;
    log
      .readBoard(serial)
      .then((board) => {
        if (!live) return;
        const readings = (board?.readings ?? []).filter((r) => r.run === resumeRun).map(toRunReading);
        const rework = (board?.rework ?? []).filter((w) => w.run === resumeRun).map(toRunRework);
        const run = board?.runs.find((r) => r.id === resumeRun);
        const ended = run?.ended ? (run.outcome === 'passed' || run.outcome === 'failed' ? run.outcome : 'aborted') : null;
        dispatch({ type: 'resume', readings, rework, ended });
        setStatus({ kind: 'idle' });
      })
      .catch((error: unknown) => live && setStatus({ kind: 'error', message: `cannot resume run ${resumeRun}: ${message(error)}` }));
    return () => {
      live = false;
    };
  }, [log, serial, resumeRun, dispatch]);

  const ensureRun = useCallback((): Promise<string> => {
    runRef.current ??= log.startRun(serial, { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator }).then((run) => {
      setRunId(run.id);
      return run.id;
    });
    runRef.current.catch(() => {
      runRef.current = null;
    });
    return runRef.current;
  }, [log, serial, plan, operator]);

  const target = useMemo(() => targets.targets.find((t) => t.check === state.selected) ?? null, [targets, state.selected]);

  /** Save a typed value for the selected check; true when it was taken (the input may be cleared). */
  const submit = useCallback(
    (text: string): boolean => {
      const s = stateRef.current;
      const t = targets.targets.find((x) => x.check === s.selected);
      if (!t || busy.current) return false;
      const locked = lockReason(s, t.check);
      if (locked) {
        setStatus({ kind: 'rejected', message: `not recorded: ${t.check}: ${locked}` });
        return false;
      }
      const assessed = assessReading(plan, t, text);
      if (!assessed.ok) {
        setStatus({ kind: 'rejected', message: `not recorded: ${assessed.message}` });
        return false;
      }
      busy.current = true;
      setStatus({ kind: 'saving', text: assessed.raw });
      void (async () => {
        try {
          const run = await ensureRun();
          const input = {
            run,
            check: t.check,
            value: assessed.value,
            unit: assessed.unit,
            raw: assessed.raw,
            operator,
            verdict: assessed.result.verdict,
            planHash: plan.hash,
          };
          const saved = await log.appendReading(serial, assessed.result.warnings.length > 0 ? { ...input, warnings: assessed.result.warnings } : input);
          dispatch({ type: 'record-reading', reading: toRunReading(saved) });
          setStatus({ kind: 'saved', id: saved.id });
        } catch (error) {
          setStatus({ kind: 'error', message: `not saved: ${message(error)}` });
        } finally {
          busy.current = false;
        }
      })();
      return true;
    },
    [targets, plan, log, serial, operator, ensureRun],
  );

  /** Select a check; returns why it cannot be selected, or null. */
  const select = useCallback(
    (check: string): string | null => {
      const reason = lockReason(stateRef.current, check);
      if (reason) setStatus({ kind: 'rejected', message: `${check} is locked: ${reason}` });
      else {
        dispatch({ type: 'select-check', check });
        setStatus({ kind: 'idle' });
      }
      return reason;
    },
    [dispatch, stateRef],
  );

  const acceptSuggestion = useCallback(() => {
    const next = stateRef.current.suggestion;
    if (next) select(next.check);
  }, [select]);

  /** Save a rework note; returns an error message, or null once it is saved. */
  const saveRework = useCallback(
    async (fields: ReworkFields): Promise<string | null> => {
      const part = fields.part.trim();
      const stages = [...plan.stages.map((s) => s.id), 'rails'];
      if (!stages.includes(part.split('.')[0] ?? '') || !part.includes('.'))
        return `part must be <stage>.<part>, e.g. ${knownParts(plan)[0] ?? 'osc.Ct'}; stages: ${stages.join(', ')}`;
      if (fields.to.trim() === '') return 'say what the part is now (to), e.g. "2n2"';
      try {
        const run = await ensureRun();
        const saved = await log.addRework(serial, { run, part, from: fields.from.trim(), to: fields.to.trim(), note: fields.note.trim(), operator });
        dispatch({ type: 'note-rework', rework: toRunRework(saved) });
        setStatus({ kind: 'note', message: `rework of ${part} saved; its stage and those after it are measured again (↻)` });
        return null;
      } catch (error) {
        return `not saved: ${message(error)}`;
      }
    },
    [plan, log, serial, operator, ensureRun],
  );

  const endRun = useCallback(
    async (outcome: EndOutcome): Promise<void> => {
      try {
        const run = await ensureRun();
        await log.endRun(serial, run, outcome satisfies RunOutcome);
        dispatch({ type: 'end-run', outcome });
        setStatus({ kind: 'note', message: `run ended: ${outcome}, saved in the log` });
      } catch (error) {
        setStatus({ kind: 'error', message: `run not ended: ${message(error)}` });
      }
    },
    [log, serial, ensureRun],
  );

  /** Turn a capture's figures into readings of the checks probed at the same point. */
  const attachCapture = useCallback(
    async (capture: CaptureFigures, expected?: string): Promise<void> => {
      const s = stateRef.current;
      const t = targets.targets.find((x) => x.check === s.selected);
      if (!t) return;
      try {
        const run = await ensureRun();
        const { file } = await log.saveCapture(capture.bytes, capture.name);
        await log.linkCapture(serial, { file, name: capture.name, at: new Date().toISOString(), check: t.check, run });
        const where = outputOf(plan, t);
        const periods = capture.measurements.frequency ? Math.round((2 * capture.sampleRate) / capture.measurements.frequency) : capture.samples.length;
        // The averaged period (from CaptureAttach) is lined up with the expected trace when drawn; else two raw periods.
        const drawn =
          capture.period && capture.period.length > 1 ? capture.period : capture.samples.slice(0, Math.max(2, Math.min(capture.samples.length, periods)));
        if (where) setCaptures((m) => new Map(m).set(where, drawn));
        if (where && capture.period && capture.period.length > 1) aligned.current.add(where);
        const planned = captureReadings(
          plan,
          targets.targets,
          t,
          { name: capture.name, figures: capture.measurements },
          (check) => lockReason(stateRef.current, check) === null,
        );
        if (planned.length === 0) {
          setStatus({ kind: 'rejected', message: `the capture has no figure for ${t.check}; it is saved as ${file}` });
          return;
        }
        const said: string[] = [];
        const warnings = captureWarnings(capture.measurements, expected);
        for (const p of planned) {
          const input = { run, check: p.check, value: p.value, unit: p.unit, raw: p.raw, operator, verdict: p.verdict, planHash: plan.hash, capture: file };
          const saved = await log.appendReading(serial, warnings.length > 0 ? { ...input, warnings } : input);
          dispatch({ type: 'record-reading', reading: toRunReading(saved) });
          said.push(`${p.check} ${p.verdict}`);
        }
        const message = `saved from ${capture.name}: ${said.join(', ')}`;
        setStatus(warnings.length > 0 ? { kind: 'warning', message: `${message} — ${warnings.join('; ')}` } : { kind: 'note', message });
      } catch (error) {
        setStatus({ kind: 'error', message: `capture not saved: ${message(error)}` });
      }
    },
    [targets, plan, log, serial, operator, ensureRun],
  );

  const measureAbort = useRef<AbortController | null>(null);
  /**
   * Take the selected check's reading from its bench instrument (`count` > 1:
   * that many readings, recorded as their mean with the spread added to the
   * guard band as 2·s/√n). The screen keeps drawing while it waits; `cancelMeasure` stops it.
   */
  const measure = useCallback(
    (count = 1, expectedShape?: string): boolean => {
      const s = stateRef.current;
      const t = targets.targets.find((x) => x.check === s.selected);
      if (!t || busy.current) return false;
      const source = instruments;
      const pick = source?.pick(t.check, t.unit, t.captureFigure) ?? null;
      if (!source || !pick) {
        setStatus({
          kind: 'rejected',
          message: source
            ? `no instrument covers ${t.check} (${t.unit}): add its id or unit to an instrument's queries`
            : 'no instruments file: see probebook instruments --help (or start a simulated bench)',
        });
        return false;
      }
      const locked = lockReason(s, t.check);
      if (locked) {
        setStatus({ kind: 'rejected', message: `not recorded: ${t.check}: ${locked}` });
        return false;
      }
      busy.current = true;
      const abort = new AbortController();
      measureAbort.current = abort;
      const since = Date.now();
      void (async () => {
        try {
          if (pick.mode === 'capture') {
            // A scope record: measured and attached like a capture file, its figures recorded for every check it answers.
            setStatus({ kind: 'measuring', instrument: pick.name, query: pick.query, since, count: 0, of: 1 });
            const record = await source.capture(pick.name, abort.signal);
            const { measurements, period } = measureRecord(record.samples, record.sampleRate);
            busy.current = false;
            await attachCapture(
              {
                name: `${pick.name}-${t.check}.csv`,
                bytes: captureCsv(record.samples, record.sampleRate),
                measurements,
                samples: record.samples,
                sampleRate: record.sampleRate,
                ...(period && period.length > 1 ? { period } : {}),
              },
              expectedShape,
            );
            return;
          }
          const values: number[] = [];
          let last: Awaited<ReturnType<InstrumentSource['read']>> | null = null;
          for (let i = 0; i < count; i++) {
            setStatus({ kind: 'measuring', instrument: pick.name, query: pick.query, since, count: i, of: count });
            last = await source.read(pick.name, t.check, t.unit, abort.signal);
            values.push(last.value);
            if (last.isOverload) break;
          }
          if (!last) return;
          const n = values.length;
          const mean = values.reduce((a, b) => a + b, 0) / n;
          const sd = n > 1 ? Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (n - 1)) : 0;
          const spec = uncertaintyFor(plan, t.check, t.unit);
          // The mean's own scatter (2·s/√n, a coverage factor of 2 as in the GUM) widens the guard band.
          const widened = n > 1 && Number.isFinite(mean) ? { relative: spec?.relative ?? 0, absolute: (spec?.absolute ?? 0) + (2 * sd) / Math.sqrt(n) } : spec;
          const value = last.isOverload ? Number.POSITIVE_INFINITY : mean;
          const result = verdictFor(t, value, Number.isFinite(value) ? widened : undefined);
          const raw = last.isOverload ? `OL (${last.raw})` : n > 1 ? `mean of ${n}: ${values.map((v) => String(+v.toPrecision(6))).join(', ')}` : last.raw;
          const run = await ensureRun();
          const input = { run, check: t.check, value, unit: t.unit, raw, operator, verdict: result.verdict, planHash: plan.hash, instrument: last.instrument };
          const saved = await log.appendReading(serial, result.warnings.length > 0 ? { ...input, warnings: result.warnings } : input);
          dispatch({ type: 'record-reading', reading: toRunReading(saved) });
          setStatus({ kind: 'saved', id: saved.id });
        } catch (error) {
          setStatus({ kind: 'error', message: `not recorded: ${message(error).replace(/; nothing was recorded$/, '')}` });
        } finally {
          busy.current = false;
          measureAbort.current = null;
        }
      })();
      return true;
    },
    [targets, plan, log, serial, operator, ensureRun, instruments, attachCapture],
  );
  const cancelMeasure = useCallback(() => measureAbort.current?.abort(), []);

  const last = state.last;
  const lastTarget: Target | undefined = last ? targets.targets.find((t) => t.check === last.check) : undefined;
  const explanation = useMemo(() => {
    if (!last || last.verdict === 'pass' || !Number.isFinite(last.value)) return { explanations: [], hints: [] };
    let explanations: ReturnType<typeof explainReading> = [];
    let hints: readonly string[] = [];
    try {
      explanations = explainReading(plan, last.check, last.value);
    } catch {
      explanations = [];
    }
    try {
      hints = hintsFor(plan, last.check);
    } catch {
      hints = [];
    }
    return { explanations, hints };
  }, [plan, last]);
  // Key handlers are swapped in after the frame is drawn: they read the explanation through a ref.
  const explanationRef = useRef(explanation);
  explanationRef.current = explanation;

  return {
    state,
    status,
    runId,
    target,
    lastTarget,
    explanation,
    explanationRef,
    submit,
    select,
    acceptSuggestion,
    saveRework,
    endRun,
    attachCapture,
    measure,
    cancelMeasure,
    /** The instrument and query the selected check would be read with, or null. */
    instrumentFor: useCallback((check: string, unit: string, figure?: string) => instruments?.pick(check, unit, figure) ?? null, [instruments]),
    stateRef,
    statusRef,
    acknowledgeCautions: useCallback(() => dispatch({ type: 'acknowledge-cautions' }), [dispatch]),
    acknowledgePowerOff: useCallback(() => dispatch({ type: 'power-off-acknowledged' }), [dispatch]),
    captured: useCallback(
      (output: string, expected?: Float64Array) => {
        const c = captures.get(output);
        if (!c) return null;
        // One averaged period: rotate it onto the expected trace (two periods) for the overlay.
        return expected && aligned.current.has(output) ? alignPeriod(expected.subarray(0, expected.length / 2), c, 2) : c;
      },
      [captures],
    ),
    clearStatus: useCallback(() => setStatus((s) => (s.kind === 'rejected' || s.kind === 'note' ? { kind: 'idle' } : s)), []),
  };
}

export type BringUp = ReturnType<typeof useBringUpState>;
