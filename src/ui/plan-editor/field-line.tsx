import { Box, Text } from 'ink';
import { formatValue } from '../../units/format.js';
import { parseValue } from '../../units/parse.js';
import { TextField } from '../components/text-field.js';
import { useTextField } from '../components/use-text-field.js';
import { toneProps } from '../theme.js';
import type { Row } from './rows.js';

/** What the value parser makes of a field as typed: `= 4.7 kΩ ± 1 %`, or its own message. */
export function readBack(row: Row, text: string): { readonly isOk: boolean; readonly text: string } | null {
  if (text.trim() === '') return row.isOptional ? { isOk: true, text: 'empty: the key is removed' } : null;
  if (row.kind === 'json') {
    try {
      JSON.parse(text);
      return { isOk: true, text: 'valid JSON' };
    } catch {
      return /^\s*[[{"]/.test(text) ? { isOk: false, text: 'not valid JSON yet' } : { isOk: true, text: 'taken as text' };
    }
  }
  if (row.kind !== 'value' || !row.unit) return null;
  const parsed = parseValue(text, { expected: row.unit });
  if (!parsed.ok) return { isOk: false, text: parsed.message };
  const tol = parsed.tol === undefined ? '' : ` ± ${Number((parsed.tol * 100).toPrecision(3))} %`;
  return { isOk: true, text: `= ${formatValue(parsed.value, parsed.unit)}${tol}` };
}

export interface FieldEditorProps {
  readonly row: Row;
  readonly initial: string;
  readonly onChange: (text: string) => void;
  readonly onSubmit: (text: string) => void;
  readonly onCancel: () => void;
}

/** The field being typed, with the parser's reading of it on the line below, updated on every key. */
export function FieldEditor({ row, initial, onChange, onSubmit, onCancel }: FieldEditorProps) {
  const field = useTextField({ initial, onChange, onSubmit, onCancel, maxLength: 400 });
  const back = readBack(row, field.value);
  return (
    <Box flexDirection="column">
      <TextField label={row.label.replace(/^▸ /, '').trim()} value={field.value} />
      <Text wrap="truncate-end" {...(back ? toneProps(back.isOk ? 'good' : 'bad') : toneProps('dim'))}>
        {back ? `${back.isOk ? '✓' : '✗'} ${back.text}` : 'Enter keeps, Esc drops'}
      </Text>
    </Box>
  );
}
