import { Text } from 'ink';
import { toneProps } from '../theme.js';

/** A key hint in the footer: the key and a one-word label. */
export type KeyHint = readonly [key: string, label: string];

export interface KeyBarProps {
  readonly hints: readonly KeyHint[];
  /** Columns available; hints that do not fit are dropped from the end. @default 80 */
  readonly width?: number;
}

/** The hints that fit into `width` columns, in order, `?` help always kept last. */
export function fitHints(hints: readonly KeyHint[], width: number): KeyHint[] {
  const help = hints.find(([k]) => k === '?');
  const rest = hints.filter(([k]) => k !== '?');
  const out: KeyHint[] = [];
  let used = help ? help[0].length + help[1].length + 1 : 0;
  for (const hint of rest) {
    const cost = hint[0].length + hint[1].length + 3;
    if (used + cost > width) break;
    out.push(hint);
    used += cost;
  }
  if (help) out.push(help);
  return out;
}

/** The footer line: `↑↓ move  Enter open  ? help`. */
export function KeyBar({ hints, width = 80 }: KeyBarProps) {
  const fitted = fitHints(hints, width);
  return (
    <Text wrap="truncate-end">
      {fitted.map(([k, label], i) => (
        <Text key={k}>
          {i > 0 ? '  ' : ''}
          <Text bold {...toneProps('accent')}>
            {k}
          </Text>{' '}
          <Text {...toneProps('dim')}>{label}</Text>
        </Text>
      ))}
    </Text>
  );
}
