// Invented boards for the review tests, on the invented osc-demo fixture plan:
// six boards, one reworked (wrong timing capacitor), one left failing.
import { rework, runBoard, type TestLog } from './real-log.js';

export const serials = ['PB-0001', 'PB-0002', 'PB-0003', 'PB-0004', 'PB-0005', 'PB-0006'] as const;

/** Latest osc.freq per board, in serial order (PB-0003 after its rework). */
export const latestFreq = [3510, 3532, 3525, 3498, 3541, 3902];

export async function fillDemoLog(t: TestLog): Promise<void> {
  const good = (freq: number, rail: number) => ({ 'rails.+9V.dc': rail, 'osc.freq': freq, 'osc.duty': 0.5 });
  await runBoard(t, 'PB-0001', good(3510, 9.02));
  await runBoard(t, 'PB-0002', good(3532, 8.97));
  // PB-0003: an 8n2 fitted for the 10n timing capacitor reads high; reworked, then passes.
  await runBoard(t, 'PB-0003', good(4290, 9.01));
  await rework(t, 'PB-0003', 'osc.Ct', '8n2', '10n', 'wrong value fitted');
  await runBoard(t, 'PB-0003', good(3525, 9.0));
  await runBoard(t, 'PB-0004', good(3498, 9.05));
  await runBoard(t, 'PB-0005', good(3541, 8.99));
  await runBoard(t, 'PB-0006', good(3902, 9.03));
}
