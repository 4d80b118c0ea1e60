import type pg from 'pg';

/** The schema version this probebook writes; `probebook_schema` holds the database's. */
export const pgSchemaVersion = 1;

/**
 * Migrations by target version, applied in order inside one transaction under
 * an advisory lock (two benches opening a new database at once make it once).
 * Timestamps stay ISO 8601 text as the folder log writes them, so a copy in
 * either direction gives back the same bytes; readings keep IEEE doubles
 * (±Infinity for an open circuit).
 */
const migrations: Readonly<Record<number, string>> = {
  1: `
    CREATE TABLE boards (
      serial text PRIMARY KEY CHECK (length(serial) BETWEEN 1 AND 64),
      plan text
    );
    CREATE TABLE plan_snapshots (
      hash text PRIMARY KEY CHECK (hash ~ '^[0-9a-f]{64}$'),
      text text NOT NULL
    );
    -- A plan snapshot is the exact text a run used: it never changes.
    CREATE FUNCTION probebook_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN RAISE EXCEPTION 'probebook: % rows are immutable', TG_TABLE_NAME; END $$;
    CREATE TRIGGER plan_snapshots_immutable BEFORE UPDATE OR DELETE ON plan_snapshots
      FOR EACH ROW EXECUTE FUNCTION probebook_immutable();
    CREATE TABLE runs (
      id text PRIMARY KEY,
      serial text NOT NULL REFERENCES boards(serial),
      seq bigserial NOT NULL,
      started text NOT NULL,
      ended text,
      operator text NOT NULL,
      outcome text NOT NULL CHECK (outcome IN ('in-progress','passed','failed','aborted','power-off')),
      plan text NOT NULL,
      plan_hash text NOT NULL REFERENCES plan_snapshots(hash)
    );
    CREATE INDEX runs_by_board ON runs(serial, seq);
    CREATE TABLE readings (
      id text PRIMARY KEY,
      serial text NOT NULL REFERENCES boards(serial),
      run text NOT NULL REFERENCES runs(id),
      seq bigserial NOT NULL,
      check_id text NOT NULL,
      value double precision NOT NULL CHECK (value <> 'NaN'),
      unit text NOT NULL,
      raw text NOT NULL,
      at text NOT NULL,
      operator text NOT NULL,
      verdict text NOT NULL CHECK (verdict IN ('pass','marginal','fail')),
      plan_hash text NOT NULL,
      capture text,
      warnings jsonb,
      instrument jsonb
    );
    CREATE INDEX readings_by_board ON readings(serial, seq);
    CREATE TABLE rework (
      id text PRIMARY KEY,
      serial text NOT NULL REFERENCES boards(serial),
      seq bigserial NOT NULL,
      at text NOT NULL,
      run text REFERENCES runs(id),
      part text NOT NULL,
      from_value text NOT NULL,
      to_value text NOT NULL,
      note text NOT NULL,
      operator text NOT NULL
    );
    CREATE INDEX rework_by_board ON rework(serial, seq);
    CREATE TABLE captures (
      file text PRIMARY KEY,
      bytes bytea NOT NULL
    );
    CREATE TABLE board_captures (
      serial text NOT NULL REFERENCES boards(serial),
      seq bigserial NOT NULL,
      file text NOT NULL REFERENCES captures(file),
      name text NOT NULL,
      at text NOT NULL,
      check_id text,
      run text,
      UNIQUE (serial, file, check_id, run)
    );
    -- The review summary, kept in the same transaction as every write (the index of the folder log).
    CREATE TABLE board_summary (
      serial text PRIMARY KEY REFERENCES boards(serial),
      plan text,
      plan_hash text,
      state text NOT NULL,
      last_run_at text,
      runs integer NOT NULL,
      readings integer NOT NULL,
      rework integer NOT NULL
    );
    CREATE INDEX board_summary_by_plan ON board_summary(plan);
    CREATE TABLE check_summary (
      serial text NOT NULL REFERENCES boards(serial),
      check_id text NOT NULL,
      first_value double precision NOT NULL,
      first_verdict text NOT NULL,
      first_at text NOT NULL,
      latest_value double precision NOT NULL,
      latest_verdict text NOT NULL,
      latest_at text NOT NULL,
      count integer NOT NULL,
      PRIMARY KEY (serial, check_id)
    );
    CREATE INDEX check_summary_by_check ON check_summary(check_id);
  `,
};

export class SchemaTooNewError extends Error {
  override readonly name = 'SchemaTooNewError';
}

/**
 * Create or migrate the schema; returns the database's version. A database
 * newer than this probebook is left alone (the caller refuses to write).
 */
export async function ensureSchema(client: pg.ClientBase): Promise<number> {
  await client.query('BEGIN');
  try {
    // One key for probebook's schema work (an arbitrary constant).
    await client.query('SELECT pg_advisory_xact_lock(7355608)');
    await client.query('CREATE TABLE IF NOT EXISTS probebook_schema (version integer NOT NULL, applied_at timestamptz NOT NULL DEFAULT now())');
    const found = await client.query<{ v: number | null }>('SELECT max(version) AS v FROM probebook_schema');
    let version = found.rows[0]?.v ?? 0;
    if (version > pgSchemaVersion) {
      await client.query('COMMIT');
      return version;
    }
    while (version < pgSchemaVersion) {
      version++;
      const sql = migrations[version];
      if (!sql) throw new Error(`no migration to schema version ${version}`);
      await client.query(sql);
      await client.query('INSERT INTO probebook_schema(version) VALUES ($1)', [version]);
    }
    await client.query('COMMIT');
    return version;
  } catch (error) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw error;
  }
}
