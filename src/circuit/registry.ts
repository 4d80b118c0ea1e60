import type { StageKind } from './types.js';
import { dividerKind } from './divider.js';
import { diodeShaperKind } from './diode-shaper.js';
import { invertingAmpKind } from './inverting-amp.js';
import { commonEmitterKind } from './common-emitter.js';
import { comparatorKind } from './comparator.js';
import { manualKind } from './manual.js';
import { mfbBandpassKind } from './mfb-bandpass.js';
import { noninvertingAmpKind } from './noninverting-amp.js';
import { pushPullKind } from './push-pull.js';
import { rcLowpassKind } from './rc-lowpass.js';
import { rcHighpassKind } from './rc-highpass.js';
import { regulatorKind } from './regulator.js';
import { sallenKeyHighpassKind } from './sallen-key-highpass.js';
import { sallenKeyLowpassKind } from './sallen-key-lowpass.js';
import { schmittIntegratorKind } from './schmitt-integrator.js';
import { signalInKind } from './signal-in.js';
import { timerAstableKind } from './timer-astable.js';
import { wienBridgeKind } from './wien-bridge.js';
import { zenerShuntKind } from './zener-shunt.js';

/** Every stage kind, by the name a plan uses. Adding a kind: one file and one line here. */
export const stageKinds: Readonly<Record<string, StageKind<unknown>>> = {
  'schmitt-integrator': schmittIntegratorKind as StageKind<unknown>,
  'diode-shaper': diodeShaperKind as StageKind<unknown>,
  'inverting-amp': invertingAmpKind as StageKind<unknown>,
  'noninverting-amp': noninvertingAmpKind as StageKind<unknown>,
  'push-pull': pushPullKind as StageKind<unknown>,
  'rc-lowpass': rcLowpassKind as StageKind<unknown>,
  divider: dividerKind as StageKind<unknown>,
  'signal-in': signalInKind as StageKind<unknown>,
  manual: manualKind as StageKind<unknown>,
  'rc-highpass': rcHighpassKind as StageKind<unknown>,
  'sallen-key-lowpass': sallenKeyLowpassKind as StageKind<unknown>,
  'sallen-key-highpass': sallenKeyHighpassKind as StageKind<unknown>,
  'mfb-bandpass': mfbBandpassKind as StageKind<unknown>,
  regulator: regulatorKind as StageKind<unknown>,
  'zener-shunt': zenerShuntKind as StageKind<unknown>,
  'wien-bridge': wienBridgeKind as StageKind<unknown>,
  comparator: comparatorKind as StageKind<unknown>,
  'common-emitter': commonEmitterKind as StageKind<unknown>,
  'timer-astable': timerAstableKind as StageKind<unknown>,
};
