import { Box, Text } from 'ink';
import { useMemo } from 'react';
import type { BatchCheck } from '../../review/batch-types.js';
import { formatFigure } from '../../review/format.js';
import { trendOf } from '../../review/trend.js';
import { cell } from '../components/columns.js';
import { scrollWindow } from '../components/scroll-window.js';
import { histogramChart } from '../charts/histogram.js';
import { trendChart } from '../charts/trend.js';
import { pointer, toneProps } from '../theme.js';
import type { BatchPanel as Panel } from './use-batch-state.js';

export interface BatchPanelProps {
  readonly check: BatchCheck;
  readonly panel: Panel;
  readonly outlierSelected: number;
  readonly height: number;
  readonly width: number;
}

/** The selected check's histogram, trend or outlier boards. */
export function BatchPanel({ check: c, panel, outlierSelected, height, width }: BatchPanelProps) {
  // Charts of 10,000 boards are drawn once per check and size, not on every key.
  const chart = useMemo(() => {
    if (panel === 'histogram')
      return histogramChart(
        c.points.map((p) => p.value),
        { width, height: Math.max(1, height - 4), band: c.band, nominal: c.nominal, unit: c.unit },
      );
    if (panel === 'trend') {
      const labelWidth = 11;
      const series = trendOf(c.points, Math.max(2, width - labelWidth - 3));
      return trendChart(series.values, { height: Math.max(2, height - 2), band: c.band, nominal: c.nominal, unit: c.unit, labelWidth });
    }
    return null;
  }, [c, panel, width, height]);
  if (chart !== null) return <Text>{chart}</Text>;
  if (c.outliers.length === 0) return <Text>No outlier boards: every latest reading is inside its band and within 3σ of the mean.</Text>;
  const { start, end } = scrollWindow(c.outliers.length, outlierSelected, height - 1, outlierSelected - Math.floor(height / 2));
  return (
    <Box flexDirection="column">
      <Text {...toneProps('dim')}>Enter opens the board's history.</Text>
      {c.outliers.slice(start, end).map((o, i) => (
        <Text key={o.serial} inverse={start + i === outlierSelected}>
          {start + i === outlierSelected ? pointer : ' '}
          {cell(
            `${cell(o.serial, 14)} ${cell(formatFigure(o.value, c.unit), 12, 'right')}  ${o.reasons.join(', ')}${o.z !== null ? `, z = ${o.z.toFixed(1)}` : ''}  ${o.at.slice(0, 16).replace('T', ' ')}`,
            width - 1,
          )}
        </Text>
      ))}
    </Box>
  );
}
