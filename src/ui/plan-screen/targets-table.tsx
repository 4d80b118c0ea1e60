import { Box, Text } from 'ink';
import type { Target } from '../../analysis/types.js';
import { cell } from '../components/columns.js';
import { pointer } from '../theme.js';
import { formatBand, formatContributor, formatNominal } from './format-band.js';

export interface TargetsTableProps {
  readonly targets: readonly Target[];
  readonly start: number;
  readonly rows: number;
  readonly selected: number;
  readonly width: number;
  /** Whether the table has the keys (the selection is drawn inverse only then). */
  readonly isFocused: boolean;
  /** Designators by part (`osc.Ct` → `C7`), from the plan's `refs`. */
  readonly refs?: ReadonlyMap<string, string>;
}

/** Column widths for a terminal width: the statistical band only from 104 columns. */
export function tableLayout(width: number) {
  const showStat = width >= 104;
  const band = width >= 90 ? 24 : 22;
  const tp = 5;
  const nominal = 11;
  const fixed = 2 + tp + nominal + band + (showStat ? band : 0);
  const rest = Math.max(20, width - fixed);
  // The contributor gets room for `osc.clamp.vz 100%`; the check id takes the rest.
  const check = Math.max(14, Math.min(30, rest - 18));
  const contributor = Math.max(6, rest - check);
  return { showStat, band, tp, nominal, check, contributor };
}

/** The targets table of the plan screen: one row per check, in bring-up order. */
export function TargetsTable({ targets, start, rows, selected, width, isFocused, refs }: TargetsTableProps) {
  const col = tableLayout(width);
  const head =
    '  ' +
    cell('check', col.check) +
    cell('TP', col.tp) +
    cell('nominal', col.nominal) +
    cell('worst-case band', col.band) +
    (col.showStat ? cell('statistical band', col.band) : '') +
    cell('top contributor', col.contributor);
  return (
    <Box flexDirection="column">
      <Text bold wrap="truncate-end">
        {head}
      </Text>
      {targets.slice(start, start + rows).map((t, i) => {
        const isSelected = start + i === selected;
        return (
          <Text key={t.check} wrap="truncate-end" inverse={isSelected && isFocused}>
            {isSelected ? `${pointer} ` : '  '}
            {cell(t.check, col.check - 1)} {cell(t.testPoint ?? '—', col.tp)}
            {cell(formatNominal(t), col.nominal - 1)} {cell(formatBand(t.worst, t.unit), col.band - 1)}{' '}
            {col.showStat ? `${cell(formatBand(t.stat, t.unit), col.band - 1)} ` : ''}
            {cell(formatContributor(t.contributors[0], refs), col.contributor)}
          </Text>
        );
      })}
    </Box>
  );
}
