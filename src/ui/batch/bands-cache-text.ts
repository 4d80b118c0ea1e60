import type { TargetList } from '../../review/bands.js';

// JSON cannot hold ±Infinity (open band sides), so they are written as strings.
const encode = (_key: string, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v);
const decode = (_key: string, v: unknown) => (v === 'Infinity' ? Infinity : v === '-Infinity' ? -Infinity : v);

/** The part of a target set the review needs, as cache text. */
export function bandsToText(set: TargetList): string {
  const targets = set.targets.map((t) => ({ check: t.check, unit: t.unit, nominal: t.nominal, worst: t.worst, stat: t.stat, testPoint: t.testPoint, how: t.how, isLimit: t.isLimit ?? false }));
  return `${JSON.stringify({ plan: set.plan, targets }, encode)}\n`;
}

/** Read cache text back; null when it is not what `bandsToText` wrote (then the targets are recomputed). */
export function bandsFromText(text: string): TargetList | null {
  let data: unknown;
  try {
    data = JSON.parse(text, decode);
  } catch {
    // A damaged cache file is only a cache miss.
    return null;
  }
  const d = data as Partial<TargetList> | null;
  if (!d || typeof d.plan !== 'string' || !Array.isArray(d.targets)) return null;
  const ok = d.targets.every(
    (t) => t && typeof t.check === 'string' && typeof t.nominal === 'number' && typeof t.worst?.min === 'number' && typeof t.worst?.max === 'number' && typeof t.stat?.min === 'number' && typeof t.isLimit === 'boolean',
  );
  return ok ? (d as TargetList) : null;
}
