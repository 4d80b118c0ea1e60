import { Box, Text } from 'ink';
import type { Measurements } from '../../signal/types.js';
import { type ExpectedShape, shapeMismatch, summaryLines } from '../../signal/summary.js';
import { traceChart } from '../charts/trace.js';
import { KeyBar } from '../components/key-bar.js';
import { TextField } from '../components/text-field.js';
import { useTextField } from '../components/use-text-field.js';
import { HelpBox } from '../components/help-box.js';
import { useLiveState } from '../components/use-live-state.js';
import { attachHelp, attachNotes } from './attach-help.js';
import { toneProps } from '../theme.js';
import { useCaptureAttachKeys } from './use-capture-attach-keys.js';
import { useCaptureAttachState } from './use-capture-attach-state.js';
import { capturedWindow, otherChannels, progressBar } from './view.js';

/** What the attach box hands back once the technician accepts the figures. */
export interface CaptureAttachResult {
  /** The file's absolute path. */
  readonly path: string;
  /** The file's bytes, to copy into the log by hash. */
  readonly bytes: Uint8Array;
  readonly measurements: Measurements;
  /** The measured channel, volts. */
  readonly samples: Float64Array;
  readonly sampleRate: number;
  /** One period averaged over the whole periods, from a rising mean-level crossing (empty when none). */
  readonly period: Float64Array;
}

export interface CaptureAttachProps {
  /** Called with the capture and its figures when the technician presses Enter on them. */
  readonly onDone: (result: CaptureAttachResult) => void;
  /** Called on Esc at the path line. */
  readonly onCancel: () => void;
  /** The shape the check expects; a different one is shown as a warning. */
  readonly expect?: ExpectedShape;
  /** Whether the box has the keyboard. @default true */
  readonly isActive?: boolean;
  /** Folder that relative paths start from. @default process.cwd() */
  readonly cwd?: string;
  /** Columns for the trace. @default 72 */
  readonly width?: number;
}

/** Attach a scope capture (CSV or WAV) to the current check: path with Tab completion, progress, figures. */
export function CaptureAttach({ onDone, onCancel, expect, isActive = true, cwd = process.cwd(), width = 72 }: CaptureAttachProps) {
  const { state, latest, edited, complete, load, back } = useCaptureAttachState(cwd);
  const { phase } = state;
  const [isHelpOpen, setHelpOpen, helpRef] = useLiveState(false);
  const toggleHelp = () => setHelpOpen((open) => !open);
  const field = useTextField({
    onHelp: toggleHelp,
    onSubmit: load,
    onCancel,
    onChange: edited,
    onOtherKey: (_input, key) => {
      if (key.tab) field.set(complete(field.current()));
    },
    isActive: false,
  });
  const attach = () => {
    const current = latest.current.phase;
    if (current.kind !== 'done') return;
    const { analyzed, path } = current;
    onDone({
      path,
      bytes: analyzed.bytes ?? new Uint8Array(0),
      measurements: analyzed.measurements,
      samples: analyzed.channel.samples,
      sampleRate: analyzed.capture.sampleRate,
      period: analyzed.period,
    });
  };
  useCaptureAttachKeys(latest, field, { back, attach, toggleHelp, isHelpOpen: () => helpRef.current }, isActive);

  if (isHelpOpen) return <HelpBox title="capture" topic="attaching a capture" entries={attachHelp} notes={attachNotes} width={width} />;

  if (phase.kind === 'loading') {
    return (
      <Box flexDirection="column">
        <Text bold>Reading {phase.path}</Text>
        <Text>{progressBar(phase.fraction, Math.min(40, width - 10))}</Text>
        <KeyBar
          hints={[
            ['Esc', 'stop waiting'],
            ['?', 'help'],
          ]}
          width={width}
        />
      </Box>
    );
  }
  if (phase.kind === 'done') {
    const { analyzed } = phase;
    const m = analyzed.measurements;
    const mismatch = expect ? shapeMismatch(m, expect) : null;
    return (
      // Rows keep their height (a squeezed row is drawn over by the next); in a short panel the trace,
      // last, is what gets cut, and the keys stay above it.
      <Box flexDirection="column" flexShrink={0}>
        {/* One row each: a line wrapped inside the bring-up panel's fixed height would be drawn over the next. */}
        <Text bold wrap="truncate-middle">
          {analyzed.capture.source}, channel {analyzed.channel.name}
        </Text>
        {summaryLines(m).map((line) => (
          <Text key={line} wrap="truncate-end">
            {line}
          </Text>
        ))}
        {mismatch ? (
          <Text wrap="truncate-end" {...toneProps('warn')}>
            ⚠ {mismatch.message}
          </Text>
        ) : null}
        {otherChannels(analyzed) ? (
          <Text wrap="truncate-end" {...toneProps('dim')}>
            {otherChannels(analyzed)}
          </Text>
        ) : null}
        {m.warnings.map((w) => (
          <Text key={w} wrap="truncate-end" {...toneProps('dim')}>
            note: {w}
          </Text>
        ))}
        <KeyBar
          hints={[
            ['Enter', 'attach these figures'],
            ['Esc', 'another file'],
            ['?', 'help'],
          ]}
          width={width}
        />
        <Text>{traceChart(null, capturedWindow(analyzed.channel.samples, analyzed.capture.sampleRate, m.frequency, 3), { width, height: 8 })}</Text>
      </Box>
    );
  }
  return (
    <Box flexDirection="column">
      <Text bold>Attach a capture (CSV or WAV){expect ? `, expecting a ${expect}` : ''}</Text>
      <TextField
        label="file"
        value={field.value}
        cursor={field.cursor}
        placeholder="path, then --dt 1us / --scale 10 / --channel 2 if needed"
        isFocused={isActive}
      />
      {state.candidates.length > 0 ? <Text {...toneProps('dim')}>{state.candidates.join('  ')}</Text> : null}
      {state.message ? <Text {...toneProps('warn')}>{state.message}</Text> : null}
      <KeyBar
        hints={[
          ['Tab', 'complete'],
          ['Enter', 'read'],
          ['Esc', 'cancel'],
          ['?', 'help'],
        ]}
        width={width}
      />
    </Box>
  );
}
