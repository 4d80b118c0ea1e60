import { Text } from 'ink';
import { toneProps } from '../theme.js';

export interface TextFieldProps {
  readonly label: string;
  readonly value: string;
  /** Where the cursor stands (0 … value.length). @default value.length */
  readonly cursor?: number;
  /** Shown dim while the value is empty. */
  readonly placeholder?: string;
  /** Whether the cursor is shown. @default true */
  readonly isFocused?: boolean;
}

/** `label: value█` — the cursor is an inverse block, visible without colour. */
export function TextField({ label, value, cursor = value.length, placeholder = '', isFocused = true }: TextFieldProps) {
  return (
    <Text wrap="truncate-start">
      <Text bold>{label}: </Text>
      <FieldText value={value} cursor={cursor} isFocused={isFocused} />
      {value === '' && placeholder ? <Text {...toneProps('dim')}> {placeholder}</Text> : null}
    </Text>
  );
}

export interface FieldTextProps {
  readonly value: string;
  /** @default value.length */
  readonly cursor?: number;
  readonly isFocused: boolean;
}

/** The text of a field with its cursor drawn as an inverse cell (a space at the end). */
export function FieldText({ value, cursor = value.length, isFocused }: FieldTextProps) {
  if (!isFocused) return <Text>{value}</Text>;
  const at = Math.min(Math.max(0, cursor), value.length);
  return (
    <Text>
      {value.slice(0, at)}
      <Text inverse>{value[at] ?? ' '}</Text>
      {value.slice(at + 1)}
    </Text>
  );
}
