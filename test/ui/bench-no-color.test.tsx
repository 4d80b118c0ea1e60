import { afterEach, describe, expect, test } from 'vitest';

// Colour must be possible for this test to mean anything: force it on before Ink loads.
process.env.FORCE_COLOR = '1';

afterEach(() => {
  delete process.env.NO_COLOR;
});

// SGR foreground colour codes 30–37, 90–97 (ECMA-48); bold and inverse are not colour.
const colour = /\u001B\[(3[0-7]|9[0-7])m/;

async function benchFrame(): Promise<string> {
  const { renderApp, seedBoard } = await import('./render-app.js');
  const app = await renderApp({
    setup: async (log, [plan]) => {
      if (!plan) throw new Error('no plan');
      await seedBoard(log, plan, 'FX-0001', [{ check: 'rails.+12V.dc', value: 12, unit: 'V', raw: '12.00', verdict: 'pass' }], 'passed');
      await seedBoard(log, plan, 'FX-0002', [{ check: 'rails.+12V.dc', value: 14, unit: 'V', raw: '14.00', verdict: 'fail' }], 'failed');
    },
  });
  try {
    return await app.waitFor('FX-0002');
  } finally {
    await app.cleanup();
  }
}

describe('NO_COLOR (no-color.org) on the bench screen', () => {
  test('states use colour normally, none with NO_COLOR, and keep their marks and words', async () => {
    expect(await benchFrame()).toMatch(colour);
    process.env.NO_COLOR = '1';
    const plain = await benchFrame();
    expect(plain).not.toMatch(colour);
    expect(plain).toContain('✓ passed');
    expect(plain).toContain('✗ failed');
  });
});
