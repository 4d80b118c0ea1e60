import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';
import type { ReworkFields } from './use-bring-up-state.js';

export const reworkFieldNames = ['part', 'from', 'to', 'note'] as const;
export type ReworkField = (typeof reworkFieldNames)[number];

export interface ReworkFormProps {
  readonly fields: ReworkFields;
  readonly focus: ReworkField;
  readonly error: string | null;
  readonly isSaving: boolean;
  /** Parts of the plan, as a reminder of the names. */
  readonly parts: readonly string[];
  readonly width: number;
}

const labels: Readonly<Record<ReworkField, string>> = { part: 'part', from: 'from', to: 'to', note: 'note' };

/** The rework note: which part changed, from what, to what, and why. */
export function ReworkForm({ fields, focus, error, isSaving, parts, width }: ReworkFormProps) {
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={width}>
      <Text bold {...toneProps('title')}>
        Rework note
      </Text>
      {reworkFieldNames.map((name) => (
        <Text key={name} wrap="truncate-start">
          <Text bold>{name === focus ? '›' : ' '} {labels[name].padEnd(5)}</Text>
          {fields[name]}
          {name === focus ? <Text inverse> </Text> : null}
        </Text>
      ))}
      <Text wrap="truncate-end" {...toneProps('dim')}>
        parts: {parts.join(' ')}
      </Text>
      {error ? (
        <Text wrap="truncate-end" {...toneProps('bad')}>
          ✗ {error}
        </Text>
      ) : null}
      <Text {...toneProps('dim')}>{isSaving ? 'saving…' : 'Tab/Enter next field · Enter on note saves · Esc cancels'}</Text>
    </Box>
  );
}
