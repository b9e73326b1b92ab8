// Benchmark circuits written as .rdn text. Deterministic (seeded) component values.
// Every circuit is driven by one ideal voltage step at t = 0 through a resistor and starts at rest,
// so the exported model starts from x(0+) = 0 with a constant input u = 1 V for t > 0.

function rng(seed) {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

const fmt = (v) => Number(v.toPrecision(4)).toString();

/** RC ladder with `states` capacitors. */
export function rcLadder(states, samples) {
  const r = rng(1);
  const lines = ['title "bench: RC ladder"', 'voltage-source V1 in -> gnd step to 1V', `resistor R0 in -> n1 ${fmt(100 + 900 * r())}`];
  for (let k = 1; k <= states; k++) {
    lines.push(`capacitor C${k} n${k} -> gnd ${fmt(1e-9 * (1 + 9 * r()))}`);
    if (k < states) lines.push(`resistor R${k} n${k} -> n${k + 1} ${fmt(100 + 900 * r())}`);
  }
  lines.push(`resistor Rload n${states} -> gnd 10k`);
  lines.push(`watch node n1`, `watch node n${Math.ceil(states / 2)}`, `watch node n${states}`, `samples ${samples}`);
  return lines.join('\n') + '\n';
}

/** Lossy LC ladder: sections of series L (with series r) and shunt C (with parallel g); 2 states per section. */
export function lcLadder(states, samples) {
  const r = rng(2);
  const sections = Math.ceil(states / 2);
  const lines = ['title "bench: lossy LC ladder"', 'voltage-source V1 in -> gnd step to 1V', 'resistor Rs in -> a0 50'];
  for (let k = 1; k <= sections; k++) {
    lines.push(`resistor Rs${k} a${k - 1} -> m${k} ${fmt(0.05 + 0.5 * r())}`);
    lines.push(`inductor L${k} m${k} -> a${k} ${fmt(1e-6 * (1 + 9 * r()))}`);
    lines.push(`capacitor C${k} a${k} -> gnd ${fmt(1e-7 * (1 + 9 * r()))}`);
    lines.push(`resistor Rp${k} a${k} -> gnd ${fmt(1e3 * (1 + 9 * r()))}`);
  }
  lines.push(`resistor Rload a${sections} -> gnd 50`);
  lines.push(`watch node a1`, `watch node a${Math.ceil(sections / 2)}`, `watch node a${sections}`, `samples ${samples}`);
  return lines.join('\n') + '\n';
}

/**
 * Random RLC mesh: M nodes, each with a capacitor to ground (M states); a chain through all nodes
 * plus random chords; states − M of the edges are a resistor in series with an inductor (one state
 * each), the others plain resistors.
 */
export function rlcMesh(states, samples) {
  const r = rng(3);
  const M = Math.ceil(0.6 * states);
  const nL = states - M;
  const edges = [];
  for (let k = 2; k <= M; k++) edges.push([1 + Math.floor(r() * (k - 1)), k]);
  const extra = Math.ceil(M / 3);
  for (let e = 0; e < extra; e++) {
    const a = 1 + Math.floor(r() * M);
    let b = 1 + Math.floor(r() * M);
    if (b === a) b = (a % M) + 1;
    edges.push([a, b]);
  }
  const lines = ['title "bench: random RLC mesh"', 'voltage-source V1 in -> gnd step to 1V', 'resistor Rin in -> n1 10'];
  for (let k = 1; k <= M; k++) lines.push(`capacitor C${k} n${k} -> gnd ${fmt(1e-8 * (1 + 99 * r()))}`);
  edges.forEach(([a, b], e) => {
    if (e < nL) {
      lines.push(`resistor Re${e} n${a} -> x${e} ${fmt(1 + 99 * r())}`);
      lines.push(`inductor Le${e} x${e} -> n${b} ${fmt(1e-6 * (1 + 99 * r()))}`);
    } else lines.push(`resistor Re${e} n${a} -> n${b} ${fmt(10 + 990 * r())}`);
  });
  lines.push(`resistor Rload n${M} -> gnd 100`);
  lines.push(`watch node n1`, `watch node n${Math.ceil(M / 2)}`, `watch node n${M}`, `samples ${samples}`);
  return lines.join('\n') + '\n';
}

export const CASES = { 'rc-ladder': rcLadder, 'lc-ladder': lcLadder, 'rlc-mesh': rlcMesh };

/** Dense random test matrix for the eig rows (uniform in [−1, 1)). */
export function randomMatrix(n, seed = 12345) {
  const r = rng(seed + n);
  return Array.from({ length: n }, () => Array.from({ length: n }, () => 2 * r() - 1));
}
