import { describe, expect, test } from 'vitest';
import { boardMigrations, type Migration, migrateBoard } from '../../src/log/migrate.js';
import { boardSchemaVersion } from '../../src/log/types.js';

describe('board schema migration path', () => {
  test('the current version passes through unchanged', () => {
    const data = { schemaVersion: boardSchemaVersion, serial: 'X' };
    expect(migrateBoard(data)).toEqual({ ok: true, data, from: boardSchemaVersion });
  });

  test('older versions are carried forward step by step (an invented two-step path)', () => {
    const table: Record<number, Migration> = {
      1: (d) => ({ ...d, schemaVersion: 2, captures: d.captures ?? [] }),
      2: (d) => ({ ...d, schemaVersion: 3, note: `from ${String(d.serial)}` }),
    };
    const result = migrateBoard({ schemaVersion: 1, serial: 'X' }, table, 3);
    expect(result).toEqual({ ok: true, from: 1, data: { schemaVersion: 3, serial: 'X', captures: [], note: 'from X' } });
  });

  test('a newer version is refused, a gap in the path is unknown, a step that lies throws', () => {
    expect(migrateBoard({ schemaVersion: boardSchemaVersion + 1 })).toMatchObject({ ok: false, kind: 'newer' });
    expect(migrateBoard({ schemaVersion: 0 }, boardMigrations)).toMatchObject({ ok: false, kind: 'unknown' });
    expect(migrateBoard({ schemaVersion: '1' })).toMatchObject({ ok: false, kind: 'unknown' });
    expect(() => migrateBoard({ schemaVersion: 1 }, { 1: (d) => d }, 2)).toThrow(/did not produce version 2/);
  });
});
