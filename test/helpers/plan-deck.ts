import type { Plan, PlanStage } from '../../src/plan/types.js';
import { opampSubcktFor } from './spice-opamp.js';

/**
 * An ngspice deck generated from a loaded plan, every stage as it is built on
 * the board, with the plan's nominal part values (or `parts` overrides):
 *
 * - op-amps: the behavioural model of spice-opamp.ts with the stage's op-amp
 *   (GBW, slew, aol, output limits at rail − headroom), powered from the plan's
 *   most positive and most negative rails;
 * - zeners of a clamp: ngspice diodes with BV = vz at IBV = 5 mA, N = 1, IS set
 *   so the forward drop is vf at 5 mA (as the oscillator's own ngspice test);
 * - shaper diodes: the stage's SPICE diode model (IS, N, RS);
 * - bias diodes of a follower: the 1N4148 model of data/diode-models.json;
 * - transistors: SPICE bipolar models reduced to IS and BF (everything else at
 *   ngspice's defaults), IS set so Ic = 1 mA at the plan's vbe (kT/q at 27 °C),
 *   BF = hfe; the PNP from its own values; bias resistors as fitted;
 * - a generator (`signal-in`): a SIN source, behind its source resistance;
 * - external `loads`: resistors to ground.
 *
 * Zero-volt sources sit in the follower's base and collector leads so the
 * deck can read its base and quiescent currents.
 */
export interface DeckOptions {
  /** Build only this stage and what lies downstream of it; its input is driven by `drive`. */
  readonly from?: string;
  /** The source on `from`'s input node, e.g. `DC 0 AC 1`. */
  readonly drive?: string;
  /** Part values by `<stage>.<role>` overriding the nominal ones. */
  readonly parts?: Readonly<Record<string, number>>;
  /** Pot setting override for an oscillator. */
  readonly pot?: number;
}

const kT = 0.025865; // V at 27 °C (300.15 K)

/** Node name of a stage output. */
export function node(stage: string, output: string): string {
  return `n_${stage}_${output}`.replace(/[^A-Za-z0-9_]/g, '_');
}

function downstream(plan: Plan, from: string): Set<string> {
  const keep = new Set([from]);
  for (const s of plan.stages) if (s.input && keep.has(s.input.stage)) keep.add(s.id);
  return keep;
}

export function planDeck(plan: Plan, options: DeckOptions = {}): string {
  const pos = Math.max(0, ...plan.rails.map((r) => r.nominal));
  const neg = Math.min(0, ...plan.rails.map((r) => r.nominal));
  const lines: string[] = [`Vrail_pos vp 0 DC ${pos}`, `Vrail_neg vn 0 DC ${neg}`];
  plan.rails.forEach((r, i) => {
    lines.push(`Vrail_${i} ${railNode(plan, r.id)} 0 DC ${r.nominal}`);
  });
  const keep = options.from ? downstream(plan, options.from) : undefined;
  for (const stage of plan.stages) {
    if (keep && !keep.has(stage.id)) continue;
    const v = (role: string): number => options.parts?.[`${stage.id}.${role}`] ?? stage.parts[role]?.nominal ?? Number.NaN;
    const has = (role: string): boolean => stage.parts[role] !== undefined;
    const input = stage.input ? node(stage.input.stage, stage.input.output) : '';
    if (options.from === stage.id && stage.input) lines.push(`Vdrive ${input} 0 ${options.drive ?? 'DC 0'}`);
    const id = stage.id.replace(/[^A-Za-z0-9]/g, '_');
    const out = (o: string): string => node(stage.id, o);
    const op = `oa_${id}`;
    const settings = stage.settings as Record<string, unknown>;
    switch (stage.kind) {
      case 'schmitt-integrator': {
        lines.push(opampSubcktFor(op, stage.opamp, { pos, neg }));
        const sq = out('square');
        const tri = out('triangle');
        const pot = options.pot ?? (settings['pot'] as number);
        lines.push(`x${id}c ${id}_np 0 ${id}_cmp ${op}`, `R${id}1 ${tri} ${id}_np ${v('R1')}`, `R${id}2 ${sq} ${id}_np ${v('R2')}`);
        lines.push(has('Rz') ? `R${id}z ${id}_cmp ${sq} ${v('Rz')}` : `V${id}link ${id}_cmp ${sq} DC 0`);
        lines.push(
          `R${id}t ${sq} ${id}_ni ${v('Rt') + (has('RV') ? v('RV') * pot : 0)}`,
          `C${id}t ${id}_ni ${tri} ${v('Ct')} IC=0.5`,
          `x${id}i 0 ${id}_ni ${tri} ${op}`,
        );
        if (has('clamp.vz')) {
          const isOf = (drop: number): string => (5e-3 / Math.exp(drop / kT)).toExponential(6);
          // dza in breakdown at the high level (vz, vf); dzb its partner (vz2, vf2).
          lines.push(`D${id}z1 ${sq} ${id}_zm dzb_${id}`, `D${id}z2 0 ${id}_zm dza_${id}`);
          lines.push(
            `.model dza_${id} D (IS=${isOf(v('clamp.vf'))} N=1 BV=${v('clamp.vz')} IBV=5m)`,
            `.model dzb_${id} D (IS=${isOf(v('clamp.vf2'))} N=1 BV=${v('clamp.vz2')} IBV=5m)`,
          );
        }
        break;
      }
      case 'diode-shaper': {
        const o = out('out');
        const d = settings['diode'] as { is: number; n: number; rs: number };
        lines.push(`R${id}s ${input} ${o} ${v('Rs')}`);
        if (has('Rload')) lines.push(`R${id}l ${o} 0 ${v('Rload')}`);
        const branches = settings['branches'] as { diodes: number; polarity: '+' | '-'; rRole: string; biasRole: string }[];
        branches.forEach((b, i) => {
          const nodes = [o, ...Array.from({ length: b.diodes }, (_, j) => `${id}_b${i}d${j}`)];
          for (let j = 0; j < b.diodes; j++) {
            const [a, c] = b.polarity === '+' ? [nodes[j], nodes[j + 1]] : [nodes[j + 1], nodes[j]];
            lines.push(`D${id}b${i}x${j} ${a} ${c} dsh_${id}`);
          }
          lines.push(`R${id}b${i} ${nodes[b.diodes]} ${id}_b${i}v ${v(b.rRole)}`, `V${id}b${i} ${id}_b${i}v 0 DC ${v(b.biasRole)}`);
        });
        lines.push(`.model dsh_${id} D (IS=${d.is} N=${d.n} RS=${d.rs})`);
        break;
      }
      case 'inverting-amp':
        lines.push(
          opampSubcktFor(op, stage.opamp, { pos, neg }),
          `R${id}in ${input} ${id}_m ${v('Rin')}`,
          `R${id}f ${out('out')} ${id}_m ${v('Rf')}`,
          `x${id} 0 ${id}_m ${out('out')} ${op}`,
        );
        break;
      case 'noninverting-amp':
        lines.push(
          opampSubcktFor(op, stage.opamp, { pos, neg }),
          `R${id}g ${id}_m 0 ${v('Rg')}`,
          `R${id}f ${out('out')} ${id}_m ${v('Rf')}`,
          `x${id} ${input} ${id}_m ${out('out')} ${op}`,
        );
        break;
      case 'rc-lowpass':
        lines.push(`R${id} ${input} ${out('out')} ${v('R')}`, `C${id} ${out('out')} 0 ${v('C')}`);
        break;
      case 'divider':
        lines.push(`R${id}t ${railNode(plan, settings['from'] as string)} ${out('out')} ${v('Rtop')}`, `R${id}b ${out('out')} 0 ${v('Rbottom')}`);
        break;
      case 'signal-in': {
        const offset = has('offset') ? v('offset') : 0;
        const open = has('source') ? `${id}_open` : out('out');
        lines.push(`V${id} ${open} 0 DC ${offset} SIN(${offset} ${v('peak')} ${v('frequency')})`);
        if (has('source')) lines.push(`R${id}s ${open} ${out('out')} ${v('source')}`);
        break;
      }
      case 'push-pull':
        lines.push(...follower(stage, id, input, out('out'), v, has));
        break;
      case 'manual':
        break;
      default:
        throw new Error(`planDeck: no deck for stage kind ${stage.kind}`);
    }
    for (const role of Object.keys(stage.parts)) {
      if (role.startsWith('loads.')) lines.push(`R${id}x${role.slice(6)} ${out(role.slice(6))} 0 ${v(role)}`);
    }
  }
  return lines.join('\n');
}

function railNode(plan: Plan, id: string): string {
  return `rail_${plan.rails.findIndex((r) => r.id === id)}`;
}

function follower(stage: PlanStage, id: string, input: string, out: string, v: (role: string) => number, has: (role: string) => boolean): string[] {
  const vbeN = has('vbe') ? v('vbe') : 0.65;
  const vbeP = has('vbe.pnp') ? v('vbe.pnp') : vbeN;
  const hfeN = has('hfe') ? v('hfe') : 100;
  const hfeP = has('hfe.pnp') ? v('hfe.pnp') : hfeN;
  const isFor = (vbe: number): string => (1e-3 / Math.expm1(vbe / kT)).toExponential(8);
  const lines = [`.model qn_${id} NPN (IS=${isFor(vbeN)} BF=${hfeN})`, `.model qp_${id} PNP (IS=${isFor(vbeP)} BF=${hfeP})`];
  const settings = stage.settings as { bias: string; hasNetwork?: boolean; hasLoad: boolean };
  let bn = input;
  let bp = input;
  if (settings.hasNetwork) {
    bn = `${id}_bn`;
    bp = `${id}_bp`;
    lines.push(`R${id}b1 vp ${bn} ${v('Rb1')}`, `D${id}1 ${bn} ${input} d4148_${id}`, `D${id}2 ${input} ${bp} d4148_${id}`, `R${id}b2 ${bp} vn ${v('Rb2')}`);
    lines.push(`.model d4148_${id} D (IS=2.52n N=1.752 RS=0.568)`);
  } else if (settings.bias !== 'none') {
    throw new Error('planDeck: a diode-biased follower needs its Rb1/Rb2 to be built');
  }
  // Sense sources: base currents (into the NPN base, out of the PNP base) and collector currents.
  lines.push(`V${id}sbn ${bn} ${id}_qbn DC 0`, `V${id}sbp ${id}_qbp ${bp} DC 0`, `V${id}scn vp ${id}_qcn DC 0`, `V${id}scp ${id}_qcp vn DC 0`);
  lines.push(`Q${id}n ${id}_qcn ${id}_qbn ${out} qn_${id}`, `Q${id}p ${id}_qcp ${id}_qbp ${out} qp_${id}`);
  if (settings.hasLoad) lines.push(`R${id}l ${out} 0 ${v('Rload')}`);
  return lines;
}
