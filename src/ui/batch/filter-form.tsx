import { Box, Text } from 'ink';
import { FieldText } from '../components/text-field.js';
import { toneProps } from '../theme.js';
import { filterFields, type FilterForm as Form } from './filter-form-state.js';

const labels = { plan: 'plan id', revision: 'revision (hash)', from: 'from (date)', to: 'to (date)' } as const;

/** The batch filter being edited; empty fields mean "any". */
export function FilterForm({ form, cursor, width }: { readonly form: Form; readonly cursor: number; readonly width: number }) {
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={Math.min(width, 70)}>
      <Text bold {...toneProps('title')}>
        Filter the batch
      </Text>
      {filterFields.map((name, i) => (
        <Text key={name} wrap="truncate-start">
          <Text bold={i === form.field}>{`${i === form.field ? '›' : ' '} ${labels[name].padEnd(17)} `}</Text>
          <FieldText value={form.values[name]} cursor={i === form.field ? cursor : form.values[name].length} isFocused={i === form.field} />
        </Text>
      ))}
      {form.error ? <Text {...toneProps('bad')}>✗ {form.error}</Text> : null}
      <Text {...toneProps('dim')}>Tab/↓ next field · Enter apply · Esc cancel · ? help · empty means any · dates like 2026-11-30</Text>
    </Box>
  );
}
