// Shared-store benchmark (issue: PostgreSQL as the shared log): 100,000 boards ×
// 25 readings in a throwaway local PostgreSQL cluster, then `batch --json` for one
// plan, `history --json` for one board and one `record`'s store work, each as
// median and p95. Goals: batch < 1 s, history < 100 ms, record store work < 10 ms.
// Boards, serials and values are invented. The bulk rows are written by SQL
// (generate_series) in the store's schema, after one real run made the plan snapshot.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { main } from '../src/cli/main.js';
import { openStore } from '../src/log/open-store.js';
import { startCluster } from '../test/helpers/pg-cluster.js';

const boards = Number(process.env.BENCH_BOARDS ?? 100_000);
const planFile = fileURLToPath(new URL('../test/log/fixtures/bias.plan.json', import.meta.url));
const planText = readFileSync(planFile, 'utf8');
const ms = (t0: number) => performance.now() - t0;
const quantile = (xs: number[], q: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(q * xs.length))] ?? NaN;
const fmt = (x: number) => `${x.toFixed(x < 10 ? 2 : 0)} ms`;

const cluster = await startCluster();
const url = cluster.url;
const sink = { stdout: () => undefined, stderr: (t: string) => process.stderr.write(t), env: { ...process.env, PROBEBOOK_LOG: url }, cwd: process.cwd() };
try {
  // One real reading through the command: it creates the schema and the plan snapshot.
  const seedStatus = await main(['record', '--plan', planFile, '--board', 'BENCH-SEED', '--check', 'ref.out.dc', '--value', '3.27'], sink);
  if (seedStatus !== 0) throw new Error('seed record failed');
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  const hash = (await c.query<{ hash: string }>('SELECT hash FROM plan_snapshots LIMIT 1')).rows[0]?.hash;
  const t0 = performance.now();
  const checks = [
    ['rails.+10V.to-ground', 'Ω', 15000, 500],
    ['rails.-10V.to-ground', 'Ω', 15000, 500],
    ['rails.idle-current', 'A', 0.012, 0.001],
    ['rails.+10V.dc', 'V', 10, 0.05],
    ['rails.-10V.dc', 'V', -10, 0.05],
    ['ref.out.dc', 'V', 3.267, 0.01],
    ['neg.out.dc', 'V', -4.06, 0.01],
  ] as const;
  await c.query(`INSERT INTO boards (serial, plan) SELECT 'B' || lpad(g::text, 6, '0'), 'bias-ref-a' FROM generate_series(1, $1) g`, [boards]);
  await c.query(
    `INSERT INTO runs (id, serial, started, ended, operator, outcome, plan, plan_hash)
     SELECT 'u-B' || lpad(g::text, 6, '0'), 'B' || lpad(g::text, 6, '0'), '2026-11-01T08:00:00.000Z', '2026-11-01T08:30:00.000Z', 'bench', 'passed', 'bias-ref-a', $2 FROM generate_series(1, $1) g`,
    [boards, hash],
  );
  // 25 readings per board: the 7 checks, repeated (latest wins), values spread by a hash of the row.
  await c.query(
    `INSERT INTO readings (id, serial, run, check_id, value, unit, raw, at, operator, verdict, plan_hash)
     SELECT 'r-B' || lpad(g::text, 6, '0') || '-' || k, 'B' || lpad(g::text, 6, '0'), 'u-B' || lpad(g::text, 6, '0'), c.check_id,
            c.nominal + c.spread * (((hashint4(g * 31 + k) % 1000) / 1000.0)), c.unit, 'bench', '2026-11-01T08:' || lpad(k::text, 2, '0') || ':00.000Z', 'bench', 'pass', $2
     FROM generate_series(1, $1) g, generate_series(0, 24) k,
     LATERAL (SELECT * FROM (VALUES ${checks.map((_, i) => `(${i}, $${3 + 4 * i}, $${4 + 4 * i}, $${5 + 4 * i}::float8, $${6 + 4 * i}::float8)`).join(', ')}) v(i, check_id, unit, nominal, spread) WHERE v.i = k % 7) c`,
    [boards, hash, ...checks.flat()],
  );
  await c.query(
    `INSERT INTO board_summary (serial, plan, plan_hash, state, last_run_at, runs, readings, rework)
     SELECT serial, 'bias-ref-a', $1, 'passed', '2026-11-01T08:00:00.000Z', 1, 25, 0 FROM boards WHERE serial <> 'BENCH-SEED'`,
    [hash],
  );
  await c.query(
    `INSERT INTO check_summary (serial, check_id, first_value, first_verdict, first_at, latest_value, latest_verdict, latest_at, count)
     SELECT serial, check_id, (array_agg(value ORDER BY seq))[1], 'pass', min(at), (array_agg(value ORDER BY seq DESC))[1], 'pass', max(at), count(*)
     FROM readings WHERE serial <> 'BENCH-SEED' GROUP BY serial, check_id`,
  );
  await c.query('ANALYZE');
  await c.end();
  console.log(`filled ${boards} boards × 25 readings in ${(ms(t0) / 1000).toFixed(1)} s`);

  // Where the batch's time goes: the index fetch alone.
  const probe = await openStore(url);
  const fetchTimes: number[] = [];
  for (let i = 0; i < 3; i++) {
    const t = performance.now();
    await probe.readIndex();
    fetchTimes.push(ms(t));
  }
  await probe.close();
  console.log(`index fetch alone (board and check summaries): median ${fmt(quantile(fetchTimes, 0.5))}`);

  // batch --json for one plan, whole command in process (targets cached after the first call).
  const batchTimes: number[] = [];
  for (let i = 0; i < 4; i++) {
    const t = performance.now();
    const status = await main(['batch', '--plan', 'bias-ref-a', '--json'], sink);
    if (status !== 0) throw new Error('batch failed');
    if (i > 0) batchTimes.push(ms(t));
  }
  const historyTimes: number[] = [];
  for (let i = 0; i < 30; i++) {
    const t = performance.now();
    await main(['history', `B${String(1 + ((i * 7919) % boards)).padStart(6, '0')}`, '--json'], sink);
    historyTimes.push(ms(t));
  }
  // The store work of one record: one transaction appending to a board's open run.
  const log = await openStore(url);
  const hashOf = (await log.readIndex()).boards['BENCH-SEED']?.planHash ?? '';
  const recordTimes: number[] = [];
  for (let i = 0; i < 60; i++) {
    const t = performance.now();
    await log.appendToOpenRun(
      `REC-${i % 10}`,
      { plan: 'bias-ref-a', planHash: hashOf, planText, operator: 'bench' },
      { check: 'ref.out.dc', value: 3.27, unit: 'V', raw: '3.27', operator: 'bench', verdict: 'pass', planHash: hashOf },
    );
    if (i >= 10) recordTimes.push(ms(t));
  }
  await log.close();
  console.log('| work (100,000 boards × 25 readings, loopback) | median | p95 | goal |');
  console.log('| --- | --- | --- | --- |');
  console.log(`| batch --json, one plan (whole command in process) | ${fmt(quantile(batchTimes, 0.5))} | ${fmt(quantile(batchTimes, 0.95))} | < 1 s |`);
  console.log(`| history --json, one board | ${fmt(quantile(historyTimes, 0.5))} | ${fmt(quantile(historyTimes, 0.95))} | < 100 ms |`);
  console.log(`| record, store work (one transaction) | ${fmt(quantile(recordTimes, 0.5))} | ${fmt(quantile(recordTimes, 0.95))} | < 10 ms |`);
} finally {
  cluster.stop();
}
