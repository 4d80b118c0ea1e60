import { type DiodeModel, defaultDiode, defaultDiodeName, diodeModels } from './diode.js';
import { StageParseError } from './errors.js';
import { nested, onlyKeys, partAt, type StageReader } from './stage-parse.js';

/**
 * A stage's `diode` key: a model name from data/diode-models.json, or the DC
 * parameters `{ "is", "n", "rs" }`; absent, the default small-signal diode.
 * (The shaper reads the same key the same way.)
 */
export function parseDiodeModel(r: StageReader): { model: DiodeModel; name: string } {
  const raw = r.json['diode'];
  if (raw === undefined) return { model: defaultDiode, name: defaultDiodeName };
  if (typeof raw === 'string') {
    const model = diodeModels[raw];
    if (!model) {
      throw new StageParseError(
        r.file,
        `${r.path}.diode`,
        `no diode model ${JSON.stringify(raw)}; write ${Object.keys(diodeModels)
          .map((m) => JSON.stringify(m))
          .join(' or ')}, or { "is": "2.52n", "n": 1.752, "rs": "0.568" }`,
      );
    }
    return { model, name: raw };
  }
  const d = nested(r, 'diode');
  onlyKeys(d, ['is', 'n', 'rs']);
  const is = partAt(d, 'is', 'A', true, { positive: true, example: '"2.52n"' });
  const n = partAt(d, 'n', '1', true, { positive: true, example: '1.752' });
  const rs = partAt(d, 'rs', 'Ω', false, { nonNegative: true, example: '"0.568"' });
  return { model: { is: is.nominal, n: n.nominal, rs: rs?.nominal ?? 0 }, name: 'custom' };
}
