import { boardSchemaVersion } from './types.js';

/** One step of the migration path: a board file of version `n` to version `n + 1`. */
export type Migration = (data: Record<string, unknown>) => Record<string, unknown>;

/**
 * The migration path, by the version each step starts from. Version 1 is the
 * first released schema, so the path is empty today; a future version 2 adds
 * `1: (v1) => ({ ...v1, schemaVersion: 2, … })` here, and every older file is
 * carried forward step by step on read (and written back in the new version
 * only when it is next saved, the old bytes kept as `.bak`).
 */
export const boardMigrations: Readonly<Record<number, Migration>> = {};

export type MigrationResult = { ok: true; data: Record<string, unknown>; from: number } | { ok: false; kind: 'newer' | 'unknown'; version: unknown };

/** Carry a parsed board file forward to `target`, or say why it cannot be. */
export function migrateBoard(
  data: Record<string, unknown>,
  migrations: Readonly<Record<number, Migration>> = boardMigrations,
  target: number = boardSchemaVersion,
): MigrationResult {
  const from = data.schemaVersion;
  if (typeof from !== 'number' || !Number.isInteger(from) || from < 0) return { ok: false, kind: 'unknown', version: from };
  if (from > target) return { ok: false, kind: 'newer', version: from };
  let current = data;
  for (let version = from; version < target; version++) {
    const step = migrations[version];
    if (!step) return { ok: false, kind: 'unknown', version: from };
    current = step(current);
    if (current.schemaVersion !== version + 1) throw new Error(`board migration from version ${version} did not produce version ${version + 1}`);
  }
  return { ok: true, data: current, from };
}
