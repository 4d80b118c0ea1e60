import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { createRunState } from '../../src/run/create.js';
import { endOptions, lockReason } from '../../src/run/gates.js';
import { runReducer } from '../../src/run/reducer.js';
import type { RunAction, RunState } from '../../src/run/types.js';
import { passingReadings, planShape, reading, rework, targets } from './fixture.js';

const fresh = (): RunState => createRunState(planShape, targets);
const started = (): RunState => runReducer(fresh(), { type: 'acknowledge-cautions' });
const apply = (state: RunState, actions: readonly RunAction[]): RunState => actions.reduce(runReducer, state);
const record = (r: ReturnType<typeof reading>): RunAction => ({ type: 'record-reading', reading: r });
const all = (): RunState => apply(started(), passingReadings().map(record));

describe('a fresh run', () => {
  test('waits for the cautions, with an unpowered check selected', () => {
    const s = fresh();
    expect(s.isCautionsPending).toBe(true);
    expect(s.selected).toBe('rails.+12V.to-ground');
    expect(s.readings).toEqual([]);
  });

  test('refuses everything but the cautions acknowledgement (same object back)', () => {
    const s = fresh();
    const refused: RunAction[] = [
      record(reading('rails.+12V.to-ground', 10_000)),
      { type: 'select-check', check: 'rails.-12V.to-ground' },
      { type: 'note-rework', rework: rework('osc.Ct') },
      { type: 'power-off-acknowledged' },
      { type: 'end-run', outcome: 'failed' },
    ];
    for (const action of refused) expect(runReducer(s, action)).toBe(s);
    const ack = runReducer(s, { type: 'acknowledge-cautions' });
    expect(ack).not.toBe(s);
    expect(ack.isCautionsPending).toBe(false);
    expect(runReducer(ack, { type: 'acknowledge-cautions' })).toBe(ack);
  });
});

describe('safety gates', () => {
  test('no powered check before the unpowered ones and the idle current', () => {
    const s = started();
    expect(runReducer(s, record(reading('rails.idle-current', 0.02)))).toBe(s);
    expect(runReducer(s, record(reading('osc.freq', 2500)))).toBe(s);
    expect(runReducer(s, { type: 'select-check', check: 'osc.freq' })).toBe(s);
    expect(lockReason(s, 'osc.freq')).toMatch(/unpowered checks first/);
    const unpowered = apply(s, [record(reading('rails.+12V.to-ground', 9000)), record(reading('rails.-12V.to-ground', 9000))]);
    expect(lockReason(unpowered, 'rails.idle-current')).toBeNull();
    expect(lockReason(unpowered, 'osc.freq')).toMatch(/current-limited/);
    expect(runReducer(unpowered, record(reading('osc.freq', 2500)))).toBe(unpowered);
  });

  test('a rail shorted to ground keeps power off', () => {
    const s = apply(started(), [record(reading('rails.+12V.to-ground', 3.2, 'fail')), record(reading('rails.-12V.to-ground', 9000))]);
    expect(lockReason(s, 'rails.idle-current')).toMatch(/rails\.\+12V\.to-ground failed/);
    expect(runReducer(s, record(reading('rails.idle-current', 0.01)))).toBe(s);
  });

  test('an idle current above the limit stops the run until power-off is acknowledged', () => {
    const before = apply(started(), [record(reading('rails.+12V.to-ground', 9000)), record(reading('rails.-12V.to-ground', 9000))]);
    const stopped = runReducer(before, record(reading('rails.idle-current', 0.12, 'fail')));
    expect(stopped.isPowerOff).toBe(true);
    const refused: RunAction[] = [
      record(reading('rails.+12V.to-ground', 9000)),
      { type: 'select-check', check: 'rails.+12V.to-ground' },
      { type: 'note-rework', rework: rework('osc.Ct') },
      { type: 'end-run', outcome: 'failed' },
      { type: 'acknowledge-cautions' },
    ];
    for (const action of refused) expect(runReducer(stopped, action)).toBe(stopped);
    const off = runReducer(stopped, { type: 'power-off-acknowledged' });
    expect(off.isPowerOff).toBe(false);
    // The rails must be measured to ground again to find the fault, and nothing powered meanwhile.
    expect([...off.stale].sort()).toEqual(['rails.+12V.to-ground', 'rails.-12V.to-ground']);
    expect(off.selected).toBe('rails.+12V.to-ground');
    expect(lockReason(off, 'rails.idle-current')).toMatch(/unpowered checks first/);
    expect(runReducer(off, { type: 'power-off-acknowledged' })).toBe(off);
  });

  test('a marginal idle current inside the limit does not stop the run but keeps powered checks shut until it passes', () => {
    const s = apply(started(), [
      record(reading('rails.+12V.to-ground', 9000)),
      record(reading('rails.-12V.to-ground', 9000)),
      record(reading('rails.idle-current', 0.0445, 'marginal')),
    ]);
    expect(s.isPowerOff).toBe(false);
    expect(lockReason(s, 'osc.freq')).toMatch(/at its limit/);
    expect(s.suggestion?.check).toBe('rails.idle-current');
    const again = runReducer(s, record(reading('rails.idle-current', 0.03)));
    expect(lockReason(again, 'osc.freq')).toBeNull();
  });

  test('a marginal rail-to-ground reading is read again before power', () => {
    const s = apply(started(), [record(reading('rails.+12V.to-ground', 101, 'marginal')), record(reading('rails.-12V.to-ground', 9000))]);
    expect(lockReason(s, 'rails.idle-current')).toMatch(/marginal/);
    expect(s.suggestion?.check).toBe('rails.+12V.to-ground');
  });
});

describe('readings', () => {
  test('a saved reading becomes the latest, and the suggestion moves on', () => {
    const s = started();
    const r = reading('rails.+12V.to-ground', 15_000);
    const next = runReducer(s, record(r));
    expect(next.latest.get('rails.+12V.to-ground')).toBe(r);
    expect(next.last).toBe(r);
    expect(next.selected).toBe('rails.+12V.to-ground');
    expect(next.suggestion?.check).toBe('rails.-12V.to-ground');
  });

  test('unknown checks, wrong units, non-finite values and repeated ids are refused', () => {
    const s = started();
    const good = reading('rails.+12V.to-ground', 15_000);
    const once = runReducer(s, record(good));
    expect(runReducer(once, record(good))).toBe(once);
    expect(runReducer(s, record({ ...reading('rails.+12V.to-ground', 1), check: 'nope.freq' }))).toBe(s);
    expect(runReducer(s, record({ ...reading('rails.+12V.to-ground', 12), unit: 'V' }))).toBe(s);
    expect(runReducer(s, record({ ...reading('rails.+12V.to-ground', 12), value: Number.NaN }))).toBe(s);
    // An open circuit is a real resistance reading.
    expect(runReducer(s, record(reading('rails.+12V.to-ground', Infinity)))).not.toBe(s);
  });

  test('selecting the already selected check changes nothing', () => {
    const s = started();
    expect(runReducer(s, { type: 'select-check', check: s.selected ?? '' })).toBe(s);
    expect(runReducer(s, { type: 'select-check', check: 'no.such.check' })).toBe(s);
    expect(runReducer(s, { type: 'select-check', check: 'rails.-12V.to-ground' }).selected).toBe('rails.-12V.to-ground');
  });
});

describe('rework', () => {
  test('a reworked part makes its stage and everything downstream measured again, first', () => {
    const s = all();
    const w = runReducer(s, { type: 'note-rework', rework: rework('osc.Ct') });
    expect([...w.stale].sort()).toEqual(['gain.out.vpp', 'osc.freq', 'osc.square.vpp', 'shaper.out.vpp']);
    expect(w.suggestion?.check).toBe('osc.freq');
    expect(w.suggestion?.why).toMatch(/before the rework of osc\.Ct/);
    expect(w.selected).toBe('osc.freq');
    expect(w.rework).toHaveLength(1);
    // Re-measuring walks the stale checks in plan order.
    const again = runReducer(w, record(reading('osc.freq', 2490)));
    expect(again.stale.has('osc.freq')).toBe(false);
    expect(again.suggestion?.check).toBe('osc.square.vpp');
  });

  test('a part at the end of the chain touches only its stage; a rail part touches every check', () => {
    const s = all();
    expect([...runReducer(s, { type: 'note-rework', rework: rework('gain.Rf') }).stale]).toEqual(['gain.out.vpp']);
    expect(runReducer(s, { type: 'note-rework', rework: rework('rails.+12V') }).stale.size).toBe(targets.length);
    expect(runReducer(s, { type: 'note-rework', rework: { ...rework('osc.Ct'), part: '  ' } })).toBe(s);
  });
});

describe('ending a run', () => {
  test('passed only when every check has a current reading and none fails', () => {
    const s = started();
    expect(endOptions(s)).toEqual(['failed', 'aborted']);
    expect(runReducer(s, { type: 'end-run', outcome: 'passed' })).toBe(s);
    const done = all();
    expect(endOptions(done)).toEqual(['passed', 'failed', 'aborted']);
    const ended = runReducer(done, { type: 'end-run', outcome: 'passed' });
    expect(ended.ended).toBe('passed');
    expect(ended.suggestion).toBeNull();
    expect(runReducer(ended, record(reading('gain.out.vpp', 6.2)))).toBe(ended);
    expect(runReducer(ended, { type: 'end-run', outcome: 'failed' })).toBe(ended);
    const stale = runReducer(done, { type: 'note-rework', rework: rework('gain.Rf') });
    expect(endOptions(stale)).toEqual(['failed', 'aborted']);
  });
});

describe('resume', () => {
  test('rebuilds the same run from the saved readings and rework notes, cautions shown again', () => {
    const readings = passingReadings().slice(0, 6);
    const live = apply(started(), readings.map(record));
    const note = rework('osc.Ct');
    const liveAfter = runReducer(live, { type: 'note-rework', rework: note });
    const resumed = runReducer(fresh(), { type: 'resume', readings, rework: [note] });
    expect(resumed.isCautionsPending).toBe(true);
    expect([...resumed.latest.entries()]).toEqual([...liveAfter.latest.entries()]);
    expect([...resumed.stale].sort()).toEqual([...liveAfter.stale].sort());
    expect(resumed.suggestion).toEqual(liveAfter.suggestion);
    expect(resumed.selected).toBe('osc.freq');
    expect(runReducer(resumed, { type: 'acknowledge-cautions' }).suggestion?.check).toBe('osc.freq');
    // Only a fresh run can be resumed, and only with something to resume.
    expect(runReducer(resumed, { type: 'resume', readings })).toBe(resumed);
    const f = fresh();
    expect(runReducer(f, { type: 'resume', readings: [] })).toBe(f);
  });

  test('a run that had already ended comes back ended and takes nothing more', () => {
    const readings = passingReadings().slice(0, 3);
    const ended = runReducer(fresh(), { type: 'resume', readings, ended: 'failed' });
    expect(ended.ended).toBe('failed');
    expect(ended.isCautionsPending).toBe(false);
    expect(ended.latest.size).toBe(3);
    expect(runReducer(ended, record(reading('rails.+12V.dc', 12)))).toBe(ended);
  });

  test('replays in time order whatever order the log gives', () => {
    const readings = passingReadings().slice(0, 4);
    const resumed = runReducer(fresh(), { type: 'resume', readings: [...readings].reverse() });
    expect(resumed.readings.map((r) => r.id)).toEqual(readings.map((r) => r.id));
    expect(resumed.suggestion?.check).toBe('rails.-12V.dc');
  });

  test('a power-off followed by more readings was acknowledged; one at the end is still pending', () => {
    const r = [reading('rails.+12V.to-ground', 9000), reading('rails.-12V.to-ground', 9000), reading('rails.idle-current', 0.2, 'fail')];
    const pending = runReducer(fresh(), { type: 'resume', readings: r });
    expect(pending.isPowerOff).toBe(true);
    const later = runReducer(fresh(), { type: 'resume', readings: [...r, reading('rails.+12V.to-ground', 9100)] });
    expect(later.isPowerOff).toBe(false);
    expect(later.stale.has('rails.-12V.to-ground')).toBe(true);
    expect(later.stale.has('rails.+12V.to-ground')).toBe(false);
  });
});

describe('properties (fast-check, 150 random sessions)', () => {
  const checks = targets.map((t) => t.check);
  const action: fc.Arbitrary<RunAction> = fc.oneof(
    fc.constant<RunAction>({ type: 'acknowledge-cautions' }),
    fc.constant<RunAction>({ type: 'power-off-acknowledged' }),
    fc.constantFrom(...checks).map((check): RunAction => ({ type: 'select-check', check })),
    fc
      .tuple(
        fc.constantFrom(...checks),
        fc.double({ min: -20, max: 20_000, noNaN: true }),
        fc.constantFrom('pass', 'marginal', 'fail') as fc.Arbitrary<'pass' | 'marginal' | 'fail'>,
      )
      .map(([check, value, verdict]): RunAction => record(reading(check, check === 'rails.idle-current' ? Math.abs(value) / 1e5 : value, verdict))),
    fc.constantFrom('osc.Ct', 'shaper.Rs', 'gain.Rf', 'rails.+12V').map((part): RunAction => ({ type: 'note-rework', rework: rework(part) })),
    fc.constantFrom('passed', 'failed', 'aborted').map((outcome): RunAction => ({ type: 'end-run', outcome: outcome as 'passed' })),
  );

  test('every powered reading follows unpowered readings and an idle current within its limit; power-off blocks all else', () => {
    fc.assert(
      fc.property(fc.array(action, { maxLength: 40 }), (actions) => {
        let s = fresh();
        for (const a of actions) {
          const before = s;
          s = runReducer(s, a);
          if (before.isPowerOff && a.type !== 'power-off-acknowledged') expect(s).toBe(before);
        }
        const limit = targets.find((t) => t.check === 'rails.idle-current')?.worst.max ?? 0;
        s.readings.forEach((r, i) => {
          const phase = targets.find((t) => t.check === r.check)?.phase;
          if (phase === 'unpowered') return;
          const earlier = s.readings.slice(0, i);
          for (const u of ['rails.+12V.to-ground', 'rails.-12V.to-ground']) expect(earlier.some((e) => e.check === u)).toBe(true);
          if (phase !== 'first-power') expect(earlier.some((e) => e.check === 'rails.idle-current' && e.value <= limit && e.verdict === 'pass')).toBe(true);
        });
      }),
      { numRuns: 150, seed: 7 },
    );
  });
});

describe('a capture with a wrong shape', () => {
  test('sends the suggestion upstream even when its figure passes, and says why', () => {
    // Safety checks, rails and the oscillator's frequency pass; the shaper's
    // output figure passes but its capture looked clipped.
    const before = apply(started(), passingReadings().slice(0, 6).map(record));
    const plain = runReducer(before, record(reading('shaper.out.vpp', 3.08)));
    const warned = runReducer(
      before,
      record({
        ...reading('shaper.out.vpp', 3.08),
        capture: 'abc.csv',
        shapeWarning: 'the capture is clipped (flat tops): check the stage gain and the rails',
      }),
    );
    expect(plain.suggestion?.why ?? '').not.toContain('clipped');
    expect(warned.suggestion?.why ?? '').toContain('the capture is clipped');
    // Upstream first (DESIGN §5): the oscillator feeding the shaper.
    expect(warned.suggestion?.check.startsWith('osc.')).toBe(true);
  });
});
