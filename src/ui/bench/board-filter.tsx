import { Text } from 'ink';
import { TextField } from '../components/text-field.js';
import type { TypeAhead } from '../components/type-ahead.js';
import { useTextField } from '../components/use-text-field.js';

export interface BoardFilterProps {
  readonly initial: string;
  readonly onChange: (text: string) => void;
  readonly onDone: () => void;
  /** `?` in the empty field: the dialog's help. */
  readonly onHelp?: () => void;
  /** @default true */
  readonly isActive?: boolean;
  /** Keys typed behind the `/` that opened the filter. */
  readonly typeAhead?: TypeAhead;
}

/** `/` narrows the list to serials or plans containing the text, as it is typed. */
export function BoardFilter({ initial, onChange, onDone, onHelp, isActive = true, typeAhead }: BoardFilterProps) {
  const { value, cursor } = useTextField({
    initial,
    onChange,
    onSubmit: onDone,
    onCancel: () => {
      onChange('');
      onDone();
    },
    isActive,
    ...(onHelp ? { onHelp } : {}),
    ...(typeAhead ? { typeAhead } : {}),
  });
  return (
    <Text>
      <TextField label="filter" value={value} cursor={cursor} placeholder="part of a serial or plan id" />
      <Text> (Enter keeps it · Esc clears)</Text>
    </Text>
  );
}
