import type { Plan, PlanStage } from '../../src/plan/types.js';
import { opampSubckt } from './spice-opamp.js';

/**
 * A whole board as an ngspice deck, written from a plan's fitted values with
 * one fault planted physically in the netlist (a part left out, a diode turned
 * round, a bridge of 1 mΩ, another value), independent of the stage models in
 * `src/circuit`. What each kind becomes:
 *
 * - rails: ideal DC sources; every op-amp is the behavioural model of
 *   spice-opamp.ts, its output limits the rails less the plan's headroom;
 * - schmitt-integrator: comparator (with a 1 mV input offset), R1, R2, Rz,
 *   Rt + RV·setting, Ct with a start charge, integrator; the clamp two zeners in series, cathode to cathode
 *   (BV = vz at 5 mA, IS giving vf at 5 mA, N = 1);
 * - diode-shaper: Rs, and per branch its diodes in series with R into a DC source
 *   at the bias; diodes are the 1N4148 model of REFERENCES.md
 *   (IS = 2.52 nA, N = 1.752, RS = 0.568 Ω, values from memory);
 * - noninverting-amp / inverting-amp: the op-amp with Rg/Rin and Rf;
 * - rc-lowpass: R and C; divider: Rtop from its rail, Rbottom to ground;
 * - signal-in: a sine source;
 * - push-pull with diode bias: 10 kΩ from each rail to each base, a bias diode
 *   from each base to the input, an NPN and a PNP follower (IS chosen so Vbe at
 *   2 mA matches the diode's drop at its bias current), Rload to ground.
 */
export interface PlantedFault {
  /** Part values to change, by `<stage>.<role>` or `rails.<id>`, SI units. */
  readonly values?: Readonly<Record<string, number>>;
  /** A physical fault on a part or part group. */
  readonly stage?: string;
  readonly role?: string;
  readonly mode?: 'open' | 'short' | 'reversed' | 'missing';
  /** For the zener pair: 0 turns the upper zener round, 1 the lower. */
  readonly variant?: number;
}

export interface BoardDeck {
  readonly netlist: string;
  /** Node of each stage output, by `<stage>.<output>`. */
  readonly nodes: Readonly<Record<string, string>>;
  /** Rail voltages as fitted, by id. */
  readonly rails: Readonly<Record<string, number>>;
}

const d1n4148 = '.model d1n4148 D (IS=2.52n N=1.752 RS=0.568)';
/** Thermal voltage at 27 °C, V (kT/q). */
const vt = 0.025852;

export function boardDeck(plan: Plan, fault: PlantedFault = {}): BoardDeck {
  const value = (stage: string, role: string): number =>
    fault.values?.[`${stage}.${role}`] ?? plan.stages.find((s) => s.id === stage)?.parts[role]?.nominal ?? Number.NaN;
  const rails: Record<string, number> = {};
  const lines: string[] = [d1n4148];
  plan.rails.forEach((r, i) => {
    rails[r.id] = fault.values?.[`rails.${r.id}`] ?? r.nominal;
    lines.push(`vrail${i} rail${i} 0 DC ${rails[r.id]}`);
  });
  const railNode = (id: string) => `rail${plan.rails.findIndex((r) => r.id === id)}`;
  const pos = Math.max(0, ...Object.values(rails));
  const neg = Math.min(0, ...Object.values(rails));
  const posNode = railNode(plan.rails.find((r) => rails[r.id] === pos)?.id ?? '');
  const negNode = railNode(plan.rails.find((r) => rails[r.id] === neg)?.id ?? '');
  const nodes: Record<string, string> = {};
  const is = (s: PlanStage, role: string, mode: PlantedFault['mode']) => fault.stage === s.id && fault.role === role && fault.mode === mode;
  /** A two-terminal resistor with its open or short applied. */
  const resistor = (s: PlanStage, role: string, a: string, b: string): string => {
    if (is(s, role, 'open') || is(s, role, 'missing')) return `* ${s.id}.${role} open`;
    return `r_${s.id}_${role.replace(/\W/g, '_')} ${a} ${b} ${is(s, role, 'short') ? 1e-3 : value(s.id, role)}`;
  };
  let opamps = 0;
  const opamp = (s: PlanStage, inp: string, inn: string, out: string): string[] => {
    const name = `oa${opamps++}`;
    return [
      opampSubckt(name, { gbw: s.opamp.gbw, slew: s.opamp.slew, aol: s.opamp.aol, vhigh: pos - s.opamp.headroom, vlow: neg + s.opamp.headroom }),
      `x${name} ${inp} ${inn} ${out} ${name}`,
    ];
  };
  for (const s of plan.stages) {
    const id = s.id;
    const input = s.input ? (nodes[`${s.input.stage}.${s.input.output}`] ?? '0') : '0';
    if (s.kind === 'schmitt-integrator') {
      const sq = `${id}_sq`;
      const tri = `${id}_tri`;
      const settings = s.settings as { pot: number; hasClamp: boolean };
      nodes[`${id}.square`] = sq;
      nodes[`${id}.triangle`] = tri;
      const cmp = s.parts['Rz'] ? `${id}_cmp` : sq;
      // A 1 mV input offset, as any real comparator has (common practice, no source): without it a
      // simulated loop that cannot run (Ct shorted) would balance at exactly 0 V, which no board does.
      lines.push(...opamp(s, `${id}_npo`, '0', cmp), `v_${id}_offset ${id}_npo ${id}_np DC 1m`);
      lines.push(resistor(s, 'R1', tri, `${id}_np`), resistor(s, 'R2', sq, `${id}_np`));
      if (s.parts['Rz']) lines.push(resistor(s, 'Rz', cmp, sq));
      const rt = value(id, 'Rt') + (s.parts['RV'] ? value(id, 'RV') * settings.pot : 0);
      lines.push(is(s, 'Rt', 'open') ? '* Rt open' : `r_${id}_rt ${sq} ${id}_ni ${rt}`);
      if (is(s, 'Ct', 'short')) lines.push(`r_${id}_ct ${id}_ni ${tri} 1e-3`);
      else if (!is(s, 'Ct', 'open')) lines.push(`c_${id}_ct ${id}_ni ${tri} ${value(id, 'Ct')} IC=0.3`);
      lines.push(...opamp(s, '0', `${id}_ni`, tri));
      if (settings.hasClamp && !is(s, 'clamp', 'open') && !is(s, 'clamp', 'missing')) {
        if (is(s, 'clamp', 'short')) lines.push(`r_${id}_clamp ${sq} 0 1e-3`);
        else {
          const vz = value(id, 'clamp.vz');
          const vf = value(id, 'clamp.vf');
          const isOf = (drop: number) => (5e-3 / Math.exp(drop / vt)).toExponential(6);
          lines.push(`.model dz_${id} D (IS=${isOf(vf)} N=1 BV=${vz} IBV=5m)`);
          // dz1: anode at the square, cathode at the middle (forward at the high level, in breakdown
          // at the low); dz2: anode at ground (in breakdown at the high level). Variant 0 turns the
          // zener that breaks down at the high level round, variant 1 the one at the low level.
          const reversed = is(s, 'clamp', 'reversed');
          const high = reversed && (fault.variant ?? 0) === 0;
          const low = reversed && (fault.variant ?? 0) === 1;
          lines.push(low ? `dz1_${id} ${id}_zm ${sq} dz_${id}` : `dz1_${id} ${sq} ${id}_zm dz_${id}`);
          lines.push(high ? `dz2_${id} ${id}_zm 0 dz_${id}` : `dz2_${id} 0 ${id}_zm dz_${id}`);
        }
      }
    } else if (s.kind === 'diode-shaper') {
      const out = `${id}_out`;
      nodes[`${id}.out`] = out;
      lines.push(resistor(s, 'Rs', input, out));
      if (s.parts['Rload']) lines.push(resistor(s, 'Rload', out, '0'));
      const branches = (s.settings as { branches: { diodes: number; polarity: '+' | '-'; rRole: string; biasRole: string }[] }).branches;
      branches.forEach((b, i) => {
        const role = `branches[${i}].diodes`;
        if (is(s, role, 'open') || is(s, role, 'missing')) return;
        const bias = `${id}_b${i}`;
        lines.push(`v_${id}_b${i} ${bias} 0 DC ${value(id, b.biasRole)}`);
        let at = out;
        const forward = (b.polarity === '+') !== is(s, role, 'reversed');
        const count = is(s, role, 'short') ? b.diodes - 1 : b.diodes;
        for (let k = 0; k < count; k++) {
          const next = `${id}_d${i}_${k}`;
          lines.push(forward ? `d_${id}_${i}_${k} ${at} ${next} d1n4148` : `d_${id}_${i}_${k} ${next} ${at} d1n4148`);
          at = next;
        }
        lines.push(`r_${id}_br${i} ${at} ${bias} ${value(id, b.rRole)}`);
      });
    } else if (s.kind === 'noninverting-amp' || s.kind === 'inverting-amp') {
      const out = `${id}_out`;
      const inn = `${id}_inn`;
      nodes[`${id}.out`] = out;
      const inverting = s.kind === 'inverting-amp';
      lines.push(...opamp(s, inverting ? '0' : input, inn, out));
      lines.push(inverting ? resistor(s, 'Rin', input, inn) : resistor(s, 'Rg', inn, '0'), resistor(s, 'Rf', out, inn));
    } else if (s.kind === 'rc-lowpass') {
      const out = `${id}_out`;
      nodes[`${id}.out`] = out;
      lines.push(resistor(s, 'R', input, out));
      if (is(s, 'C', 'short')) lines.push(`r_${id}_c ${out} 0 1e-3`);
      else if (!is(s, 'C', 'open')) lines.push(`c_${id}_c ${out} 0 ${value(id, 'C')}`);
      // A very large resistor keeps the node defined when R is open.
      lines.push(`r_${id}_leak ${out} 0 1e12`);
    } else if (s.kind === 'divider') {
      const out = `${id}_out`;
      nodes[`${id}.out`] = out;
      lines.push(resistor(s, 'Rtop', railNode((s.settings as { from: string }).from), out), resistor(s, 'Rbottom', out, '0'), `r_${id}_leak ${out} 0 1e12`);
    } else if (s.kind === 'signal-in') {
      const out = `${id}_out`;
      nodes[`${id}.out`] = out;
      lines.push(`v_${id} ${out} 0 SIN(0 ${value(id, 'peak')} ${value(id, 'frequency')})`);
    } else if (s.kind === 'push-pull') {
      const out = `${id}_out`;
      nodes[`${id}.out`] = out;
      const bu = `${id}_bu`;
      const bd = `${id}_bd`;
      // Bias current through each diode, and an NPN/PNP whose Vbe at 2 mA equals the diode's drop there.
      const ib = (pos - 0.6) / 10e3;
      const vd = 1.752 * vt * Math.log(1 + ib / 2.52e-9) + ib * 0.568;
      const isq = (2e-3 / Math.exp(vd / vt)).toExponential(6);
      lines.push(`.model qn_${id} NPN (IS=${isq} BF=100)`, `.model qp_${id} PNP (IS=${isq} BF=100)`);
      lines.push(`rbu_${id} ${posNode} ${bu} 10k`, `rbd_${id} ${bd} ${negNode} 10k`);
      if (!is(s, 'bias[0]', 'missing') && !is(s, 'bias[0]', 'open'))
        lines.push(is(s, 'bias[0]', 'short') ? `rdu_${id} ${bu} ${input} 1e-3` : `ddu_${id} ${bu} ${input} d1n4148`);
      if (!is(s, 'bias[1]', 'missing') && !is(s, 'bias[1]', 'open'))
        lines.push(is(s, 'bias[1]', 'short') ? `rdd_${id} ${input} ${bd} 1e-3` : `ddd_${id} ${input} ${bd} d1n4148`);
      if (!is(s, 'Q[0]', 'open')) lines.push(`qn_${id} ${posNode} ${bu} ${out} qn_${id}`);
      if (!is(s, 'Q[1]', 'open')) lines.push(`qp_${id} ${negNode} ${bd} ${out} qp_${id}`);
      lines.push(s.parts['Rload'] ? resistor(s, 'Rload', out, '0') : `r_${id}_leak ${out} 0 1e9`);
    } else {
      throw new Error(`spice-board: no netlist for kind ${s.kind}`);
    }
  }
  return { netlist: lines.join('\n'), nodes, rails };
}
