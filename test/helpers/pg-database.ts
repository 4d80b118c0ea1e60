import pg from 'pg';
import { inject } from 'vitest';

/** A fresh, empty database on the test server; `drop` removes it. */
export async function freshDatabase(tag: string): Promise<{ url: string; drop: () => Promise<void> }> {
  const server = inject('pgUrl');
  const name = `pb_${tag.replace(/[^a-z0-9]/gi, '_').toLowerCase()}_${process.pid}_${Math.floor(Math.random() * 1e9)}`;
  const admin = new pg.Client({ connectionString: server });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE ${name}`);
  } finally {
    await admin.end();
  }
  const url = new URL(server);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    drop: async () => {
      const c = new pg.Client({ connectionString: server });
      await c.connect();
      try {
        await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      } finally {
        await c.end();
      }
    },
  };
}
