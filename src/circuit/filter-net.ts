import type { ComplexSlot, Response } from './harmonic-response.js';
import { LinearNet, type NetElement, type NetOpamp, setCapacitor, setResistor } from './linear-net.js';
import type { OpampModel, StageFault } from './types.js';

/** A part of an op-amp filter placed between two nodes of its net (0 ground, 1 input). */
export interface PlacedPart {
  readonly role: string;
  readonly a: number;
  readonly b: number;
  readonly type: 'R' | 'C';
}

/**
 * The net of a filter section for one sample of its parts, with a non-value
 * fault applied (open: the part removed; short: a milliohm bridge).
 */
export function buildNet(
  nodes: number,
  placed: readonly PlacedPart[],
  values: Readonly<Record<string, number>>,
  fault: StageFault | undefined,
  opamp: NetOpamp,
): LinearNet {
  const elements: NetElement[] = placed.map((p) => {
    const e: NetElement = { a: p.a, b: p.b, g: 0, c: 0 };
    const mode = fault && fault.role === p.role && fault.mode !== 'reversed' ? fault.mode : undefined;
    if (p.type === 'R') setResistor(e, values[p.role] ?? Number.NaN, mode);
    else setCapacitor(e, values[p.role] ?? Number.NaN, mode);
    return e;
  });
  return new LinearNet(nodes, elements, opamp);
}

/** The transfer function from the input to `node` of a net, as a harmonic response. */
export function netResponse(net: LinearNet, node: number, op: OpampModel): Response {
  return (f: number, out: ComplexSlot) => {
    net.solve(f, op);
    out.re = net.re[node] as number;
    out.im = net.im[node] as number;
  };
}

/** Value of a part for a closed form, with an open part far out and a short near zero. */
export function faultedValue(role: string, type: 'R' | 'C', value: number, fault: StageFault | undefined): number {
  if (!fault || fault.role !== role) return value;
  const isOpen = fault.mode === 'open' || fault.mode === 'missing';
  if (type === 'R') return isOpen ? 1e15 : fault.mode === 'short' ? 1e-3 : value;
  return isOpen ? 0 : fault.mode === 'short' ? 1e6 : value;
}
