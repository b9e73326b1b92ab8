import type { Circuit, Part } from '../circuit/circuit.js';
import { GROUND } from '../circuit/circuit.js';
import { type Mat, type Vec, zeros } from '../linalg/dense.js';
import { stampPart } from './stamps/index.js';

/**
 * Modified nodal analysis in descriptor form:  E·ż = A·z + B·u.
 * Unknowns z: node voltages (ground excluded), then one branch current per inductor and per
 * voltage source. Inputs u: one per independent source, in declaration order.
 * Outputs are linear in z, ż and u (a capacitor current needs ż).
 */
export interface Descriptor {
  nodes: string[];
  nz: number;
  /** E and A as dense matrices, formed on first use (the index-one path reads only the rows) */
  readonly E: Mat;
  readonly A: Mat;
  /** E's and A's rows as column → value (a circuit touches few entries per row) */
  Erows: SparseRows;
  Arows: SparseRows;
  B: Mat;
  inputs: Part[];
  /** column of z holding each inductor's / voltage source's branch current */
  branchIndex: Map<string, number>;
}

/** A linear read-out y = cz·z + cd·ż + du·u. */
export interface Probe {
  cz: Vec;
  cd: Vec;
  du: Vec;
}

/** A matrix by rows, each row a map from column to its nonzero value. */
export type SparseRows = Map<number, number>[];

/** M[i][j] += v on sparse rows. */
export function addAt(M: SparseRows, i: number, j: number, v: number): void {
  M[i].set(j, (M[i].get(j) ?? 0) + v);
}

function dense(M: SparseRows, n: number): Mat {
  const out = zeros(n, n);
  M.forEach((row, i) => row.forEach((v, j) => (out[i][j] = v)));
  return out;
}

export interface StampContext {
  /** index of a node in z, or −1 for ground */
  node(name: string): number;
  /** index in z of the part's own branch current (inductors and voltage sources) */
  branch(part: Part): number;
  /** index of the part in u (sources) */
  input(part: Part): number;
  E: SparseRows;
  A: SparseRows;
  B: Mat;
}

export function buildDescriptor(circuit: Circuit): Descriptor {
  const nodes = circuit.nodes.filter((n) => n !== GROUND);
  const nodeIdx = new Map(nodes.map((n, i) => [n, i]));
  const branchIndex = new Map<string, number>();
  let nz = nodes.length;
  for (const p of circuit.parts) {
    if (p.kind === 'inductor' || p.kind === 'voltage-source') branchIndex.set(p.name, nz++);
  }
  const inputs = circuit.parts.filter((p) => p.kind === 'voltage-source' || p.kind === 'current-source');
  const inputIdx = new Map(inputs.map((p, i) => [p.name, i]));
  const E: SparseRows = Array.from({ length: nz }, () => new Map());
  const A: SparseRows = Array.from({ length: nz }, () => new Map());
  const B = zeros(nz, inputs.length);
  const ctx: StampContext = {
    node: (name) => (name === GROUND ? -1 : (nodeIdx.get(name) ?? fail(`unknown node ${name}`))),
    branch: (part) => branchIndex.get(part.name) ?? fail(`no branch current for ${part.name}`),
    input: (part) => inputIdx.get(part.name) ?? fail(`${part.name} is not a source`),
    E,
    A,
    B,
  };
  for (const p of circuit.parts) stampPart(p, ctx);
  let Ed: Mat | null = null;
  let Ad: Mat | null = null;
  return {
    nodes,
    nz,
    get E() {
      return (Ed ??= dense(E, nz));
    },
    get A() {
      return (Ad ??= dense(A, nz));
    },
    Erows: E,
    Arows: A,
    B,
    inputs,
    branchIndex,
  };
}

function fail(msg: string): never {
  throw new Error(`internal: ${msg}`);
}

/** Read-out of v(a) − v(b). */
export function voltageProbe(d: Descriptor, a: string, b: string): Probe {
  const p = emptyProbe(d);
  // a node absent from this configuration (cut off by an open switch) reads as 0 V
  const ia = a === GROUND ? -1 : d.nodes.indexOf(a);
  const ib = b === GROUND ? -1 : d.nodes.indexOf(b);
  if (ia >= 0) p.cz[ia] += 1;
  if (ib >= 0) p.cz[ib] -= 1;
  return p;
}

/** Read-out of the current through a part, positive from its first terminal to its second. */
export function currentProbe(d: Descriptor, part: Part): Probe {
  const v = voltageProbe(d, part.a, part.b);
  const p = emptyProbe(d);
  switch (part.kind) {
    case 'resistor':
      p.cz = v.cz.map((c) => c / part.value);
      break;
    case 'capacitor':
      p.cd = v.cz.map((c) => c * part.value);
      break;
    case 'inductor':
    case 'voltage-source':
      p.cz[d.branchIndex.get(part.name)!] = 1;
      break;
    case 'current-source':
      p.du[d.inputs.indexOf(part)] = 1;
      break;
    case 'switch':
      break; // an open switch without off-resistance carries no current
  }
  return p;
}

export function emptyProbe(d: Descriptor): Probe {
  return { cz: new Array(d.nz).fill(0), cd: new Array(d.nz).fill(0), du: new Array(d.inputs.length).fill(0) };
}
