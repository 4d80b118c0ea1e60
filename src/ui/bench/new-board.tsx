import { Box, Text } from 'ink';
import { validateSerial } from '../../log/serial.js';
import { TextField } from '../components/text-field.js';
import type { TypeAhead } from '../components/type-ahead.js';
import { useTextField } from '../components/use-text-field.js';
import { pointer, toneProps } from '../theme.js';
import type { PlanChoice } from './plan-catalog.js';

export interface SerialEntryProps {
  readonly onSubmit: (serial: string) => void;
  /** Called as the serial is edited (the screen clears an old message). */
  readonly onChange?: (serial: string) => void;
  readonly onCancel: () => void;
  /** `?` in the empty field: the dialog's help. */
  readonly onHelp?: () => void;
  /** @default true */
  readonly isActive?: boolean;
  /** Keys typed behind the `n` that opened the field. */
  readonly typeAhead?: TypeAhead;
}

/** The new-board serial field, with the log's serial rule checked as it is typed. */
export function SerialEntry({ onSubmit, onChange, onCancel, onHelp, isActive = true, typeAhead }: SerialEntryProps) {
  const { value, cursor } = useTextField({
    onSubmit,
    onCancel,
    isActive,
    maxLength: 80,
    ...(onChange ? { onChange } : {}),
    ...(onHelp ? { onHelp } : {}),
    ...(typeAhead ? { typeAhead } : {}),
  });
  const problem = value.trim() === '' ? null : validateSerial(value.trim());
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1}>
      <Text bold>New board</Text>
      <TextField label="serial" value={value} cursor={cursor} placeholder="e.g. EXB-0042" />
      {problem ? (
        <Text wrap="wrap" {...toneProps('warn')}>
          ✗ {problem}
        </Text>
      ) : (
        <Text {...toneProps('dim')}>Enter to continue · Esc cancels · ? help</Text>
      )}
    </Box>
  );
}

export interface PlanChoicesProps {
  readonly serial: string;
  readonly choices: readonly PlanChoice[];
  readonly selected: number;
  readonly width: number;
}

/** Which plan the new board is built to: the `--plan` files and the log's snapshots. */
export function PlanChoices({ serial, choices, selected, width }: PlanChoicesProps) {
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={Math.min(width, 100)}>
      <Text bold>Plan for {serial}</Text>
      {choices.map((c, i) => {
        const where = c.origin === 'file' ? c.plan.file : `log snapshot ${c.plan.hash.slice(0, 8)}`;
        const used = c.boards === 1 ? '1 board' : `${c.boards} boards`;
        return (
          <Text key={c.plan.hash} inverse={i === selected} wrap="truncate-end">
            {i === selected ? `${pointer} ` : '  '}
            {c.plan.plan} ({where}, {used}) — {c.plan.title}
          </Text>
        );
      })}
      <Text {...toneProps('dim')}>↑↓ choose · Enter start the run · Esc cancel · ? help</Text>
    </Box>
  );
}
