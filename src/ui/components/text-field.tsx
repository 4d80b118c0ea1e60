import { Text } from 'ink';
import { toneProps } from '../theme.js';

export interface TextFieldProps {
  readonly label: string;
  readonly value: string;
  /** Shown dim while the value is empty. */
  readonly placeholder?: string;
  /** Whether the cursor is shown. @default true */
  readonly isFocused?: boolean;
}

/** `label: value█` — the cursor is an inverse block, visible without colour. */
export function TextField({ label, value, placeholder = '', isFocused = true }: TextFieldProps) {
  return (
    <Text wrap="truncate-start">
      <Text bold>{label}: </Text>
      <Text>{value}</Text>
      {isFocused ? <Text inverse> </Text> : null}
      {value === '' && placeholder ? <Text {...toneProps('dim')}> {placeholder}</Text> : null}
    </Text>
  );
}
