import type { StageKind } from './types.js';
import { dividerKind } from './divider.js';
import { diodeShaperKind } from './diode-shaper.js';
import { invertingAmpKind } from './inverting-amp.js';
import { commonEmitterKind } from './common-emitter.js';
import { comparatorKind } from './comparator.js';
import { manualKind } from './manual.js';
import { noninvertingAmpKind } from './noninverting-amp.js';
import { pushPullKind } from './push-pull.js';
import { rcLowpassKind } from './rc-lowpass.js';
import { regulatorKind } from './regulator.js';
import { schmittIntegratorKind } from './schmitt-integrator.js';
import { signalInKind } from './signal-in.js';
import { timerAstableKind } from './timer-astable.js';
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
  regulator: regulatorKind as StageKind<unknown>,
  'zener-shunt': zenerShuntKind as StageKind<unknown>,
  comparator: comparatorKind as StageKind<unknown>,
  'common-emitter': commonEmitterKind as StageKind<unknown>,
  'timer-astable': timerAstableKind as StageKind<unknown>,
};
