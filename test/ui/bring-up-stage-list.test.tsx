import { render } from 'ink-testing-library';
import { describe, expect, test } from 'vitest';
import { createRunState } from '../../src/run/create.js';
import { runReducer } from '../../src/run/reducer.js';
import type { RunState } from '../../src/run/types.js';
import { StageList } from '../../src/ui/bring-up/stage-list.js';
import { planShape, reading, rework, targets } from '../run/fixture.js';

function measured(): RunState {
  let s = runReducer(createRunState(planShape, targets), { type: 'acknowledge-cautions' });
  for (const [check, value, verdict] of [
    ['rails.+12V.to-ground', 12_000, 'pass'],
    ['rails.-12V.to-ground', 11_000, 'pass'],
    ['rails.idle-current', 0.02, 'pass'],
    ['rails.+12V.dc', 12.3, 'marginal'],
    ['rails.-12V.dc', -12, 'pass'],
    ['osc.freq', 1000, 'fail'],
  ] as const)
    s = runReducer(s, { type: 'record-reading', reading: reading(check, value, verdict) });
  return runReducer(s, { type: 'note-rework', rework: rework('osc.Ct') });
}

describe('stage list', () => {
  test('marks each check: verdict, measure again, not yet, locked', () => {
    const fresh = runReducer(createRunState(planShape, targets), { type: 'acknowledge-cautions' });
    const a = render(<StageList state={fresh} cursor={0} width={22} height={6} />);
    expect(a.lastFrame()).toBe(['rails', '▸· +12V.to-ground', ' · -12V.to-ground', ' ⊘ idle-current', ' ⊘ +12V.dc', ' ⊘ -12V.dc'].join('\n'));
    a.unmount();
  });

  test('after readings and a rework of osc.Ct, and the cursor in view when focused', () => {
    const s = measured();
    const b = render(<StageList state={s} cursor={5} isFocused width={22} height={8} />);
    const lines = (b.lastFrame() ?? '').split('\n').map((l) => l.trimEnd());
    // 13 rows in 8: a third of the window above the cursor, clamped so the window ends at the last row.
    expect(lines).toEqual([' ✓ -12V.dc', 'osc', '›↻ freq', ' · square.vpp', 'shaper', ' · out.vpp', 'gain', ' · out.vpp']);
    b.rerender(<StageList state={s} cursor={3} isFocused width={22} height={8} />);
    expect(
      (b.lastFrame() ?? '')
        .split('\n')
        .map((l) => l.trimEnd())
        .slice(0, 5),
    ).toEqual([' ✓ -12V.to-ground', ' ✓ idle-current', '›≈ +12V.dc', ' ✓ -12V.dc', 'osc']);
    b.unmount();
  });
});
