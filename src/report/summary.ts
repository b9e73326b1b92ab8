import type { Circuit } from '../circuit/circuit.js';
import type { StateInfo } from '../simulate/result.js';
import { heading, table } from './table.js';
import { wrapWords } from './wrap.js';
import { describePartValue, kindName } from './waveform.js';

/** Circuit summary for the run report: nodes, parts with values, states. */
export function circuitSection(circuit: Circuit, states: readonly StateInfo[]): string[] {
  const lines = heading(`Circuit (${circuit.file})`);
  lines.push(...wrapWords(`  nodes: ${circuit.nodes.length > 0 ? circuit.nodes.join(', ') : '(none)'}, and ground (gnd)`, 80, '    '));
  lines.push('  parts:');
  lines.push(...table(circuit.parts.map((p) => [p.name, kindName(p), `${p.a} -> ${p.b}`, describePartValue(p)]), '    '));
  if (states.length > 0) {
    const list = states.map((s) => `${s.name} (${s.kind === 'capacitor-voltage' ? 'capacitor voltage' : 'inductor current'})`).join(', ');
    lines.push(...wrapWords(`  states: ${list}`, 80, '    '));
  } else {
    lines.push('  states: none (purely resistive)');
  }
  return lines;
}
