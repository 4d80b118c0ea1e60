import { Text } from 'ink';
import type { Target } from '../../analysis/types.js';
import type { CaptureFigures } from './capture-readings.js';

export interface CaptureSlotProps {
  readonly target: Target;
  readonly onDone: (capture: CaptureFigures) => void;
  readonly onCancel: () => void;
}

// TEMPORARY until src/ui/capture/CaptureAttach lands.
export function CaptureSlot(_props: CaptureSlotProps) {
  return <Text>capture attach is not available yet · Esc</Text>;
}
