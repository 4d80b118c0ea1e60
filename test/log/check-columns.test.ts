import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { decodeCheckColumns, encodeCheckColumns } from '../../src/log/check-columns.js';
import type { CheckMap } from '../../src/log/index-journal.js';
import { openLog } from '../../src/log/store.js';
import { summarizeBoard } from '../../src/log/summary.js';

const planText = '{"plan":"cols-demo","note":"invented"}';
const { createHash } = await import('node:crypto');
const planHash = createHash('sha256').update(planText).digest('hex');

// Invented per-check summaries: a canonical time, a time written without milliseconds
// (a board copied from elsewhere), an overload (+∞), a re-measured check (first ≠ latest).
const maps: [string, CheckMap][] = [
  [
    'CC-001',
    {
      'osc.freq': {
        first: { value: 1002.5, verdict: 'pass', at: '2026-11-02T09:00:00.000Z' },
        latest: { value: 1002.5, verdict: 'pass', at: '2026-11-02T09:00:00.000Z' },
        count: 1,
      },
      'amp.out.vpp': {
        first: { value: Infinity, verdict: 'fail', at: '2026-11-02T09:01:00Z' },
        latest: { value: 7.25, verdict: 'marginal', at: '2026-11-02T09:05:00+01:00' },
        count: 3,
      },
    },
  ],
  ['CC-002', {}],
  [
    'CC-003',
    {
      'osc.freq': {
        first: { value: -0, verdict: 'marginal', at: '2026-11-03T10:00:00.000Z' },
        latest: { value: 998, verdict: 'pass', at: '2026-11-03T10:02:00.000Z' },
        count: 2,
      },
    },
  ],
];

describe('per-check columns file', () => {
  test('round-trips every summary exactly: values (±∞, −0), verdicts, counts and the time texts as written', () => {
    const columns = decodeCheckColumns(encodeCheckColumns(maps));
    expect(columns).not.toBeNull();
    for (const [serial, map] of maps) {
      const back = columns?.checksOf(serial);
      expect(back).toEqual(map);
      for (const check in map) expect(Object.is(back?.[check]?.first.value, map[check]?.first.value)).toBe(true);
    }
    expect(columns?.checksOf('CC-404')).toBeNull();
    expect(columns?.rowsOf('CC-002')).toBe(1);
    // The board's rows are the ones between rowStart[b] and rowStart[b + 1], in the map's order.
    const b = columns?.rowsOf('CC-001') ?? -1;
    expect([columns?.rowStart[b], columns?.rowStart[b + 1]]).toEqual([0, 2]);
    expect(columns?.latestAt(1)).toBe('2026-11-02T09:05:00+01:00');
    expect(Number.isNaN(columns?.latestAtMs[1])).toBe(true);
    expect(columns?.latestAtMs[0]).toBe(Date.parse('2026-11-02T09:00:00.000Z'));
  });

  test('any summaries round-trip (property, fixed seed)', () => {
    const point = fc.record({
      value: fc.double(),
      verdict: fc.constantFrom('pass' as const, 'marginal' as const, 'fail' as const),
      at: fc.oneof(
        fc.date({ min: new Date(0), max: new Date(Date.UTC(9999, 0)), noInvalidDate: true }).map((d) => d.toISOString()),
        fc.string(),
      ),
    });
    const summary = fc.record({ first: point, latest: point, count: fc.integer({ min: 1, max: 2 ** 32 - 1 }) });
    const board = fc.dictionary(
      fc.string({ minLength: 1 }).filter((k) => k !== '__proto__'),
      summary,
      { maxKeys: 6 },
    );
    fc.assert(
      fc.property(fc.uniqueArray(fc.tuple(fc.string({ minLength: 1 }), board), { selector: (t) => t[0], maxLength: 6 }), (boards) => {
        const columns = decodeCheckColumns(encodeCheckColumns(boards));
        for (const [serial, map] of boards) expect(columns?.checksOf(serial)).toEqual(map);
      }),
    );
  });

  test('a torn, truncated, flipped or foreign file is refused (null), never half-read', () => {
    const bytes = encodeCheckColumns(maps);
    expect(decodeCheckColumns(bytes.subarray(0, bytes.length - 1))).toBeNull();
    expect(decodeCheckColumns(new Uint8Array(0))).toBeNull();
    expect(decodeCheckColumns(new TextEncoder().encode('{"schemaVersion":4,"checks":{}}'))).toBeNull();
    for (const at of [5, 20, bytes.length - 1, Math.floor(bytes.length / 2)]) {
      const flipped = new Uint8Array(bytes);
      flipped[at] = (flipped[at] ?? 0) ^ 0x10;
      expect(decodeCheckColumns(flipped)).toBeNull();
    }
    // A copy at an odd offset inside a larger buffer reads the same (typed arrays need alignment).
    const shifted = new Uint8Array(bytes.length + 3);
    shifted.set(bytes, 3);
    expect(decodeCheckColumns(shifted.subarray(3))?.checksOf('CC-001')).toEqual(maps[0]?.[1]);
  });

  test('a log whose columns file is damaged: a verifying read rebuilds it from the board files, and the summaries match the boards', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'probebook-cols-'));
    const log = await openLog(dir);
    for (let i = 0; i < 3; i++) {
      const serial = `CD-${i}`;
      const run = await log.startRun(serial, { plan: 'cols-demo', planHash, planText, operator: 'ann' });
      await log.appendReading(serial, { run: run.id, check: 'a.dc', value: 1 + i, unit: 'V', raw: String(1 + i), operator: 'ann', verdict: 'pass', planHash });
      await log.appendReading(serial, { run: run.id, check: 'a.dc', value: 2 + i, unit: 'V', raw: String(2 + i), operator: 'ann', verdict: 'fail', planHash });
    }
    // Fold the journal into a snapshot and a columns file.
    await log.readIndex(undefined, { verify: true });
    const snapshot = JSON.parse(readFileSync(join(dir, 'index.json'), 'utf8')) as { checksFile: string };
    writeFileSync(join(dir, 'index.journal'), '');
    expect(snapshot.checksFile).toMatch(/^index-checks\.[0-9a-f]+\.bin$/);
    const path = join(dir, snapshot.checksFile);
    const bytes = readFileSync(path);
    bytes[bytes.length - 1] = (bytes[bytes.length - 1] ?? 0) ^ 0xff;
    writeFileSync(path, bytes);
    const index = await (await openLog(dir)).readIndex(undefined, { verify: true });
    for (let i = 0; i < 3; i++) {
      const serial = `CD-${i}`;
      const board = await log.readBoard(serial);
      expect(board).not.toBeNull();
      if (board) expect(index.boards[serial]?.checks).toEqual(summarizeBoard(board).checks);
    }
    // A new intact file named by the snapshot has taken its place (the replaced one stays one
    // generation for readers still holding the old snapshot, as with every compaction).
    const after = JSON.parse(readFileSync(join(dir, 'index.json'), 'utf8')) as { checksFile: string };
    expect(after.checksFile).not.toBe(snapshot.checksFile);
    expect(
      readdirSync(dir)
        .filter((n) => n.startsWith('index-checks.'))
        .sort(),
    ).toEqual([after.checksFile, snapshot.checksFile].sort());
    expect(decodeCheckColumns(readFileSync(join(dir, after.checksFile)))?.checksOf('CD-2')).toEqual(index.boards['CD-2']?.checks);
    expect(index.checkColumns?.rowsOf('CD-1')).toBeGreaterThanOrEqual(0);
  });
});
