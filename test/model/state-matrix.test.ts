/**
 * The state-space model of small circuits against their state equations written by hand (nodal
 * analysis with capacitor voltages and inductor currents as states, textbook, from memory): every
 * entry of A and B at round-off, and couplings the circuit does not have exactly zero. The ladder
 * takes the index-one path with the states a permutation of the unknowns; the floating capacitor
 * the general one (X not a permutation) with a three-unknown block of nodes without capacitors.
 */
import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { buildModel } from '../../src/model/build.js';

function model(text: string) {
  const m = buildModel(loadCircuit(text, 'x.rdn'));
  const at = new Map(m.ss.states.map((s, i) => [s.name, i]));
  return { ss: m.ss, at: (name: string) => at.get(name)! };
}

// round-off: the Schur complement of the nodes without capacitors mixes conductances two orders apart
const REL = 1e-11;

function expectEntries(M: number[][], want: number[][]): void {
  expect(M.length).toBe(want.length);
  want.forEach((row, i) =>
    row.forEach((w, j) => {
      if (w === 0) expect(M[i][j]).toBe(0);
      else expect(Math.abs(M[i][j] - w) / Math.abs(w)).toBeLessThan(REL);
    }),
  );
}

describe('state matrix', () => {
  it('lossy LC ladder (series r, L; shunt C, G): L·i′ = v(k−1) − r·i − v(k), C·v′ = i(k) − i(k+1) − G·v', () => {
    const Rs = 50;
    const r = [0.3, 0.2, 0.4];
    const L = [2e-6, 3e-6, 5e-6];
    const C = [1e-7, 4e-7, 2e-7];
    const Rp = [2e3, 5e3, 3e3];
    const Rload = 50;
    const lines = ['voltage-source V1 in -> gnd step to 1V', `resistor Rs in -> a0 ${Rs}`];
    for (let k = 1; k <= 3; k++) {
      lines.push(`resistor Rs${k} a${k - 1} -> m${k} ${r[k - 1]}`, `inductor L${k} m${k} -> a${k} ${L[k - 1]}`);
      lines.push(`capacitor C${k} a${k} -> gnd ${C[k - 1]}`, `resistor Rp${k} a${k} -> gnd ${Rp[k - 1]}`);
    }
    lines.push(`resistor Rload a3 -> gnd ${Rload}`, 'watch node a3');
    const { ss, at } = model(lines.join('\n') + '\n');
    const A = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
    const B = Array.from({ length: 6 }, () => [0]);
    for (let k = 0; k < 3; k++) {
      const i = at(`i(L${k + 1})`);
      const v = at(`v(C${k + 1})`);
      // node a0 has no capacitor: v(a0) = u − Rs·i1
      A[i][i] = -(r[k] + (k === 0 ? Rs : 0)) / L[k];
      A[i][v] = -1 / L[k];
      if (k > 0) A[i][at(`v(C${k})`)] = 1 / L[k];
      else B[i][0] = 1 / L[k];
      A[v][i] = 1 / C[k];
      if (k < 2) A[v][at(`i(L${k + 2})`)] = -1 / C[k];
      A[v][v] = -(1 / Rp[k] + (k === 2 ? 1 / Rload : 0)) / C[k];
    }
    expectEntries(ss.A, A);
    expectEntries(ss.B, B);
  });

  it('floating capacitor behind a resistive divider: Thevenin source, C1 across y–z, C2 from z to ground', () => {
    const [R1, R2, R3, R4, R5, C1, C2] = [1e3, 2e3, 3e3, 4e3, 5e3, 1e-6, 2e-6];
    const text = [
      'voltage-source V1 in -> gnd step to 1V',
      `resistor R1 in -> x ${R1}`,
      `resistor R2 x -> gnd ${R2}`,
      `resistor R3 x -> y ${R3}`,
      `capacitor C1 y -> z ${C1}`,
      `capacitor C2 z -> gnd ${C2}`,
      `resistor R4 z -> gnd ${R4}`,
      `resistor R5 y -> gnd ${R5}`,
      'watch node z',
    ].join('\n');
    const { ss, at } = model(text + '\n');
    // y sees Vth = u·R2/(R1 + R2) through Ra = R1∥R2 + R3; with v1 = y − z, v2 = z:
    // C1·v1′ = (Vth − v1 − v2)/Ra − (v1 + v2)/R5,  C2·v2′ = C1·v1′ − v2/R4
    const Ra = (R1 * R2) / (R1 + R2) + R3;
    const g = 1 / Ra + 1 / R5;
    const vth = R2 / (R1 + R2);
    const v1 = at('v(C1)');
    const v2 = at('v(C2)');
    const A = [
      [0, 0],
      [0, 0],
    ];
    const B = [[0], [0]];
    A[v1][v1] = -g / C1;
    A[v1][v2] = -g / C1;
    A[v2][v1] = -g / C2;
    A[v2][v2] = -(g + 1 / R4) / C2;
    B[v1][0] = vth / Ra / C1;
    B[v2][0] = vth / Ra / C2;
    expectEntries(ss.A, A);
    expectEntries(ss.B, B);
  });
});
