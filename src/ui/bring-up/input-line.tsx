import { Box, Text } from 'ink';
import { useEffect, useState } from 'react';
import { FieldText } from '../components/text-field.js';
import { toneProps } from '../theme.js';
import type { Status } from './use-bring-up-state.js';

export interface InputLineProps {
  /** The check the value goes to. */
  readonly check: string | null;
  readonly text: string;
  /** Where the cursor stands in the text. @default text.length */
  readonly cursor?: number;
  readonly status: Status;
  /** Whether the input has the keyboard. @default true */
  readonly isFocused?: boolean;
  /** The placeholder shown while the input is empty. */
  readonly placeholder: string;
  readonly width: number;
}

/** `osc.freq › 2.49k█` and, under it, what happened to the last value. */
export function InputLine({ check, text, cursor = text.length, status, isFocused = true, placeholder, width }: InputLineProps) {
  return (
    <Box flexDirection="column" width={width}>
      <Text wrap="truncate-start">
        <Text bold>{check ?? '—'} › </Text>
        <FieldText value={text} cursor={cursor} isFocused={isFocused} />
        {text === '' ? <Text {...toneProps('dim')}> {placeholder}</Text> : null}
      </Text>
      <StatusLine status={status} />
    </Box>
  );
}

/** `reading dmm (MEAS:VOLT:DC?)… 1.2 s · Esc cancels`, the time ticking while the instrument is asked. */
function Measuring({ status }: { readonly status: Extract<Status, { kind: 'measuring' }> }) {
  const [now, setNow] = useState(Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNow(Date.now()), 200);
    return () => clearInterval(timer);
  }, []);
  const elapsed = Math.max(0, (now - status.since) / 1000).toFixed(1);
  const which = status.of > 1 ? ` ${status.count + 1} of ${status.of}` : '';
  return (
    <Text wrap="truncate-end" {...toneProps('accent')}>
      reading {status.instrument}
      {which} ({status.query})… {elapsed} s · Esc cancels
    </Text>
  );
}

function StatusLine({ status }: { readonly status: Status }) {
  switch (status.kind) {
    case 'loading':
      return <Text {...toneProps('dim')}>reading the board's log to resume…</Text>;
    case 'saving':
      return <Text {...toneProps('accent')}>saving {status.text}…</Text>;
    case 'measuring':
      return <Measuring status={status} />;
    case 'rejected':
      return (
        <Text wrap="truncate-end" {...toneProps('warn')}>
          ✗ {status.message}
        </Text>
      );
    case 'note':
      return (
        <Text wrap="truncate-end" {...toneProps('good')}>
          ✓ {status.message}
        </Text>
      );
    case 'warning':
      return (
        <Text wrap="wrap" {...toneProps('warn')}>
          ! {status.message}
        </Text>
      );
    case 'error':
      return (
        <Text wrap="truncate-end" {...toneProps('bad')}>
          ✗ {status.message}
        </Text>
      );
    default:
      return <Text> </Text>;
  }
}
