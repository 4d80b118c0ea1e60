import type { TestProject } from 'vitest/node';
import { startCluster } from './pg-cluster.js';

declare module 'vitest' {
  export interface ProvidedContext {
    pgUrl: string;
  }
}

/**
 * One PostgreSQL server for the whole test run: the one `.ci/run` started
 * (`PROBEBOOK_TEST_PG`), else a throwaway cluster started here and stopped
 * after the run. Each test file makes its own database on it.
 */
export default async function setup(project: TestProject): Promise<() => void> {
  const given = process.env.PROBEBOOK_TEST_PG;
  if (given) {
    project.provide('pgUrl', given);
    return () => undefined;
  }
  const cluster = await startCluster();
  project.provide('pgUrl', cluster.url);
  return () => cluster.stop();
}
