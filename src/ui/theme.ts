import type { Verdict } from '../analysis/types.js';
import type { BoardState } from '../log/types.js';

/**
 * Colours and marks for every screen. Colour only ever repeats what a mark or a
 * word already says, so a monochrome terminal, a colour-blind technician or
 * NO_COLOR (https://no-color.org: any non-empty value turns colour off) lose
 * nothing.
 */
export type Tone = 'good' | 'warn' | 'bad' | 'dim' | 'accent' | 'title';

const palette: Readonly<Record<Tone, string>> = {
  good: 'green',
  warn: 'yellow',
  bad: 'red',
  dim: 'gray',
  accent: 'cyan',
  title: 'blueBright',
};

/** Whether colour is on for this environment. */
export function isColorOn(env: NodeJS.ProcessEnv = process.env): boolean {
  const value = env.NO_COLOR;
  return value === undefined || value === '';
}

/** The Ink colour for a tone, or undefined when colour is off. */
export function tone(name: Tone, env: NodeJS.ProcessEnv = process.env): string | undefined {
  return isColorOn(env) ? palette[name] : undefined;
}

/** `{color}` props for `<Text>`, empty when colour is off (exactOptionalPropertyTypes-safe). */
export function toneProps(name: Tone, env: NodeJS.ProcessEnv = process.env): { color?: string } {
  const color = tone(name, env);
  return color === undefined ? {} : { color };
}

/** Verdict marks: a shape and a word, never colour alone. */
export const verdictMark: Readonly<Record<Verdict, string>> = { pass: '✓', marginal: '≈', fail: '✗' };
export const verdictTone: Readonly<Record<Verdict, Tone>> = { pass: 'good', marginal: 'warn', fail: 'bad' };

/** Board states on the bench screen. */
export const stateMark: Readonly<Record<BoardState, string>> = {
  untouched: '·',
  'in-progress': '▶',
  passed: '✓',
  failed: '✗',
  reworked: '↻',
};
export const stateWord: Readonly<Record<BoardState, string>> = {
  untouched: 'untouched',
  'in-progress': 'in progress',
  passed: 'passed',
  failed: 'failed',
  reworked: 'reworked',
};
export const stateTone: Readonly<Record<BoardState, Tone>> = {
  untouched: 'dim',
  'in-progress': 'accent',
  passed: 'good',
  failed: 'bad',
  reworked: 'warn',
};

/** The pointer in front of the selected row (selection is also shown inverse). */
export const pointer = '›';
