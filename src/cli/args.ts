import { UsageError } from './errors.js';

export type OptionType = 'string' | 'boolean';

export interface ArgSpec {
  /** Option names without dashes, and their type. */
  readonly options: Readonly<Record<string, OptionType>>;
  /** How many positionals the command takes at least and at most. */
  readonly positionals?: readonly [min: number, max: number];
  /** The usage line, shown in errors. */
  readonly usage: string;
  /**
   * String options whose value may be a negative number (`--value -11.95`,
   * DESIGN §7); any other value that starts with `-` looks like a flag and is refused.
   */
  readonly negativeNumbers?: readonly string[];
}

export interface ParsedArgs {
  readonly options: Readonly<Record<string, string | boolean | undefined>>;
  readonly positionals: readonly string[];
}

const negativeNumber = /^-\s*(?:\d|\.\d)/;

/**
 * Parse `--name value`, `--name=value` and `--flag`. Nothing typed is taken
 * silently: an option given twice is refused (no option of the commands is
 * repeatable; the last one used to win), and a value that looks like a flag
 * (`--operator --json`) is refused rather than saved, except a negative number
 * for the options that take one, so negative readings work as typed
 * (`--value -11.95`, `--value=-11.95`): the negative rail is read on every board.
 */
export function parseArgs(argv: readonly string[], spec: ArgSpec): ParsedArgs {
  const options: Record<string, string | boolean | undefined> = {};
  const positionals: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const word = argv[i] ?? '';
    if (word === '--') {
      positionals.push(...argv.slice(i + 1));
      break;
    }
    // `-h` is `--help` on every command that has one (the usual short form).
    if (word === '-h' && spec.options.help === 'boolean') {
      options.help = true;
      continue;
    }
    if (word.startsWith('--')) {
      const eq = word.indexOf('=');
      const name = eq >= 0 ? word.slice(2, eq) : word.slice(2);
      const type = spec.options[name];
      if (!type) throw new UsageError(`unknown option --${name}; usage: ${spec.usage}`);
      const before = options[name];
      if (type === 'boolean') {
        if (eq >= 0) throw new UsageError(`--${name} takes no value; usage: ${spec.usage}`);
        if (before !== undefined) throw new UsageError(`--${name} is given twice; give it once`);
        options[name] = true;
        continue;
      }
      let value: string;
      if (eq >= 0) {
        value = word.slice(eq + 1);
      } else {
        const next = argv[i + 1];
        if (next === undefined) throw new UsageError(`--${name} needs a value; usage: ${spec.usage}`);
        value = next;
        i++;
      }
      if (value.startsWith('-') && !(spec.negativeNumbers?.includes(name) && negativeNumber.test(value))) {
        throw new UsageError(`--${name} needs a value, but ${JSON.stringify(cut(value))} looks like an option; nothing was done. usage: ${spec.usage}`);
      }
      if (typeof before === 'string') {
        throw new UsageError(`--${name} is given twice (${JSON.stringify(cut(before))} and ${JSON.stringify(cut(value))}); give it once, nothing was done`);
      }
      options[name] = value;
    } else if (word.startsWith('-') && word.length > 1 && !/^-[\d.]/.test(word)) {
      throw new UsageError(`unknown option ${word}; usage: ${spec.usage}`);
    } else {
      positionals.push(word);
    }
  }
  const [min, max] = spec.positionals ?? [0, 0];
  if (positionals.length < min) throw new UsageError(`missing argument; usage: ${spec.usage}`);
  if (positionals.length > max) throw new UsageError(`unexpected argument ${JSON.stringify(positionals[max])}; usage: ${spec.usage}`);
  return { options, positionals };
}

function cut(text: string): string {
  return text.length > 40 ? `${text.slice(0, 40)}…` : text;
}

/** A whole-number option within limits, or a UsageError. */
export function intOption(value: string | boolean | undefined, name: string, fallback: number, min: number, max: number): number {
  if (value === undefined) return fallback;
  const n = typeof value === 'string' && /^\d+$/.test(value.trim()) ? Number(value) : Number.NaN;
  if (!Number.isSafeInteger(n) || n < min || n > max)
    throw new UsageError(`--${name} takes a whole number from ${min} to ${max}, got ${JSON.stringify(value)}`);
  return n;
}
