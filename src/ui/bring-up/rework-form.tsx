import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';
import { FieldText } from '../components/text-field.js';
import { type ReworkField, type ReworkFields, reworkFieldNames } from './screen-state.js';

export interface ReworkFormProps {
  readonly fields: ReworkFields;
  /** The field being edited. */
  readonly field: ReworkField;
  /** The cursor in that field. */
  readonly cursor: number;
  readonly error: string | null;
  readonly isSaving: boolean;
  /** Parts of the plan, as a reminder of the names. */
  readonly parts: readonly string[];
  readonly width: number;
}

const labels: Readonly<Record<ReworkField, string>> = { part: 'part', from: 'from', to: 'to', note: 'note' };

/** The rework note: which part changed, from what, to what, and why. */
export function ReworkForm({ fields, field, cursor, error, isSaving, parts, width }: ReworkFormProps) {
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={width}>
      <Text bold {...toneProps('title')}>
        Rework note
      </Text>
      {reworkFieldNames.map((name) => (
        <Text key={name} wrap="truncate-start">
          <Text bold>
            {name === field ? '›' : ' '} {labels[name].padEnd(5)}
          </Text>
          <FieldText value={fields[name]} cursor={name === field ? cursor : fields[name].length} isFocused={name === field && !isSaving} />
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
