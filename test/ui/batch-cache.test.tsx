import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { bandsFromText, bandsToText } from '../../src/ui/batch/bands-cache-text.js';
import { planBandSource, resolveCacheDir } from '../../src/ui/batch/plan-bands.js';
import { makeLog, runBoard } from '../review/real-log.js';

describe('targets cache for the review', () => {
  test('keeps open band sides (±∞) through the cache text', () => {
    const set = { plan: 'p', targets: [{ check: 'rails.+9V.to-ground', unit: 'Ω' as const, nominal: 100, worst: { min: 100, max: Infinity }, stat: { min: 100, max: Infinity }, testPoint: null, how: 'ohms', isLimit: true }] };
    expect(bandsFromText(bandsToText(set))).toEqual(set);
    expect(bandsFromText('{"plan": 1}')).toBeNull();
    expect(bandsFromText('{not json')).toBeNull();
    // A file cut short by a crash is a cache miss, never a band.
    expect(bandsFromText(bandsToText(set).slice(0, 40))).toBeNull();
  });

  test('writes the targets of a snapshot once and reads them back equal to the engine', async () => {
    const t = await makeLog();
    await runBoard(t, 'PB-0100', { 'osc.freq': 3520 });
    const cacheDir = mkdtempSync(join(tmpdir(), 'probebook-cache-'));
    const first = await planBandSource(t.log, { cacheDir }).get(t.plan.hash);
    const files = readdirSync(cacheDir);
    expect(files).toHaveLength(1);
    expect(files[0]).toContain(t.plan.hash);
    // A fresh source reads the file; the bands equal the engine's own (exact).
    const again = await planBandSource(t.log, { cacheDir }).get(t.plan.hash);
    expect(again?.bands.get('osc.freq')?.worst).toEqual(t.target('osc.freq').worst);
    expect(again?.bands.get('rails.+9V.to-ground')?.worst.max).toBe(Infinity);
    // The limit-check mark survives the cache (the engine sets it; a lost mark would bring back a deviation from a threshold).
    expect(again?.bands.get('rails.+9V.to-ground')?.isLimit).toBe(true);
    expect(again?.bands.get('osc.freq')?.isLimit).toBe(false);
    expect(first?.order).toEqual(t.targets.targets.map((x) => x.check));
  });

  test('the cache folder follows PROBEBOOK_CACHE, then XDG_CACHE_HOME (XDG Base Directory Specification)', () => {
    expect(resolveCacheDir({ PROBEBOOK_CACHE: '/x/c' })).toBe('/x/c');
    expect(resolveCacheDir({ XDG_CACHE_HOME: '/x/xdg' })).toBe('/x/xdg/probebook');
    expect(resolveCacheDir({})).toMatch(/\.cache\/probebook$/);
  });
});
