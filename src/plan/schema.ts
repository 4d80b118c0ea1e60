import { z } from 'zod';

/**
 * The shape of a plan file (DESIGN §3, contract keys). Only the keys shared by
 * every plan are checked here; a stage's kind-specific keys (`parts`, `pot`,
 * `clamp`, `branches`, …) pass through to the kind's own `parse`. Values stay
 * text here; `load.ts` turns them into SI numbers with their units.
 */

/** A value as a plan writes it: text with a unit (`"4k7 1%"`), or a plain number for dimensionless ones. */
const valueText = z.union([z.string(), z.number()], { error: 'expected a value such as "12 V" or "4k7 1%"' });
const text = (what: string) => z.string({ error: `expected ${what}` });
// Names that reach check ids, screens and reports: no control characters (an escape
// sequence would drive the terminal, a newline forge a line), and short.
const noControl = /^[^\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]*$/;
const name = (what: string, max: number) =>
  text(what)
    .max(max, { error: `at most ${max} characters` })
    .regex(noControl, { error: 'holds a control character (an escape sequence, a tab or a line break); type the name alone' });

const railSchema = z.strictObject({
  id: name('a rail name such as "+12V"', 40).min(1, { error: 'a rail needs a name such as "+12V"' }),
  nominal: text('a rail voltage such as "12 V" or "-12 V"'),
  tol: z.optional(text('a tolerance such as "3%"')),
  /** Where the rail is probed, e.g. `"TP1"` (an addition to the contract keys). */
  testPoint: z.optional(name('a test point name such as "TP1"', 40)),
});

const opampSchema = z.strictObject({
  gbw: z.optional(valueText),
  slew: z.optional(valueText),
  headroom: z.optional(valueText),
  maxSupply: z.optional(valueText),
  aol: z.optional(valueText),
  /** Input offset, its ± maximum (`"2 mV"`). */
  vos: z.optional(valueText),
  /** Input bias current, optionally toleranced (`"80 nA 50%"`). */
  ib: z.optional(valueText),
});

/** The board's ambient range (`{"min": "15 °C", "max": "40 °C"}`), a worst-case dimension of junction laws. */
const temperatureSchema = z.strictObject({
  min: text('a temperature such as "15 °C"'),
  max: text('a temperature such as "40 °C"'),
});

const uncertaintySchema = z.strictObject({
  V: z.optional(text('an uncertainty such as "0.5% + 2 mV"')),
  A: z.optional(text('an uncertainty such as "1% + 0.1 mA"')),
  Hz: z.optional(text('an uncertainty such as "0.01%"')),
  ohm: z.optional(text('an uncertainty such as "1% + 1 ohm"')),
  s: z.optional(text('an uncertainty such as "1% + 10 ns"')),
  F: z.optional(text('an uncertainty such as "2% + 5 pF"')),
  'V/V': z.optional(text('an uncertainty such as "1%"')),
  '1': z.optional(text('an uncertainty such as "0.5%"')),
});

/** Stage ids name check ids (`osc.freq`), so they may not hold dots or spaces. */
const stageId = z.string({ error: 'expected a stage id such as "osc"' }).regex(/^[A-Za-z][A-Za-z0-9_-]*$/, {
  error: 'a stage id starts with a letter and holds only letters, digits, "-" and "_" (it becomes part of check ids such as "osc.freq")',
});

export const stageSchema = z.looseObject({
  id: stageId,
  kind: text('a stage kind such as "divider"'),
  input: z.optional(text('an upstream output such as "osc.triangle"')),
  testPoints: z.optional(z.record(z.string(), name('a test point name such as "TP3"', 40), { error: 'expected test points by output, e.g. {"out": "TP4"}' })),
  opamp: z.optional(opampSchema),
  refs: z.optional(
    z.record(z.string(), text('a reference designator such as "C7"'), {
      error: 'expected reference designators by part role, e.g. {"Ct": "C7", "clamp": "D3/D4"}',
    }),
  ),
  /**
   * External loads on the stage's outputs, by output name (`{"out": "600 ohm 5%"}`):
   * a line, a meter or scope input the bench hangs there. An addition to the contract keys.
   */
  loads: z.optional(z.record(z.string(), valueText, { error: 'expected loads by output, e.g. {"out": "600 ohm 5%"}' })),
});

export const planSchema = z.strictObject({
  /** Allowed so editors can point at a schema file; ignored. */
  $schema: z.optional(z.string()),
  plan: text('a plan id such as "exciter-b"').regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, {
    error: 'a plan id holds letters, digits, ".", "-" and "_", e.g. "exciter-b"',
  }),
  /** Control characters are taken out of it when loaded (see load.ts); at most 200 characters. */
  title: text('a title such as "Sensor exciter, rev B"').max(200, { error: 'a title is at most 200 characters' }),
  note: z.optional(text('free text')),
  rails: z.array(railSchema, { error: 'expected a list of rails, e.g. [{"id": "+12V", "nominal": "12 V", "tol": "3%"}]' }),
  idleCurrent: z.optional(z.strictObject({ max: text('a current such as "45 mA"') })),
  railShortMin: z.optional(valueText),
  opamp: z.optional(opampSchema),
  temperature: z.optional(temperatureSchema),
  uncertainty: z.optional(uncertaintySchema),
  checkUncertainty: z.optional(z.record(z.string(), text('an uncertainty such as "0.1%"'))),
  /** The bench writes decimal commas: a reading typed as `"1,500"` against this plan is 1.5 (else refused as ambiguous). */
  decimalComma: z.optional(z.boolean({ error: 'expected true or false' })),
  stages: z.array(stageSchema, { error: 'expected a list of stages' }).min(1, { error: 'a plan needs at least one stage' }),
});

export type RawPlan = z.infer<typeof planSchema>;
export type RawRail = z.infer<typeof railSchema>;
export type RawOpamp = z.infer<typeof opampSchema>;

/** A JSON path as people read it: `stages[1].parts.Rt`. */
export function jsonPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else {
      const name = String(key);
      out += /^[A-Za-z_$][\w$]*$/.test(name) ? (out === '' ? name : `.${name}`) : `[${JSON.stringify(name)}]`;
    }
  }
  return out;
}
