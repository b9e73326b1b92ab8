import type { Circuit, Part, Watch, WaveTerm } from '../../src/circuit/circuit.js';

/** Build a validated circuit directly (bypassing the parser) for solver tests. */
const loc = { file: 'test', line: 1, col: 1, length: 0 };

export function part(kind: Part['kind'], name: string, a: string, b: string, value: number, extra: Partial<Part> = {}): Part {
  return { kind, name, a, b, value, loc, ...extra };
}

export function source(kind: 'voltage-source' | 'current-source', name: string, a: string, b: string, ...terms: WaveTerm[]): Part {
  return { kind, name, a, b, value: 0, waveform: { terms }, loc };
}

export function sw(name: string, a: string, b: string, on: number, initiallyClosed: boolean, events: { t: number; closed: boolean }[], off = Infinity): Part {
  return { kind: 'switch', name, a, b, value: on, switching: { onResistance: on, offResistance: off, initiallyClosed, events }, loc };
}

export function watchPart(kind: 'part-voltage' | 'part-current', name: string): Watch {
  return { target: { kind, part: name }, label: `${kind === 'part-voltage' ? 'v' : 'i'}(${name})`, unit: kind === 'part-voltage' ? 'V' : 'A', loc };
}

export function watchNode(node: string): Watch {
  return { target: { kind: 'node', node }, label: `v(${node})`, unit: 'V', loc };
}

export function circuit(parts: Part[], watches: Watch[], span: number, samples = 2001, start: 'settled' | 'rest' = 'rest'): Circuit {
  const nodes = [...new Set(parts.flatMap((p) => [p.a, p.b]))];
  return { file: 'test', nodes, parts, watches, analysis: { span, samples, settle: { kind: 'relative', fraction: 0.02 }, start, derating: 0.8 }, params: {} };
}

/** Largest |got − want(t)| over all samples, relative to the largest |want|. */
export function worst(times: Float64Array, got: Float64Array, want: (t: number) => number): number {
  let peak = 0;
  for (const t of times) peak = Math.max(peak, Math.abs(want(t)));
  let err = 0;
  times.forEach((t, i) => {
    err = Math.max(err, Math.abs(got[i] - want(t)) / peak);
  });
  return err;
}
