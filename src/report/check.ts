import { describeStructure } from '../circuit/structure.js';
import type { Circuit, Watch, WatchTarget } from '../circuit/circuit.js';
import { formatPlain, formatSI, formatSIExact } from './si.js';
import { heading, table } from './table.js';
import { warningLine } from './text.js';
import { wrapWords } from './wrap.js';
import { describeRatings, describeSwitching, describeWaveform, isSource, kindName, partUnit } from './waveform.js';

/** A long list (a generated ladder has hundreds of states) as its first 20 and last 4 names. */
function shortList(names: readonly string[]): string {
  if (names.length <= 40) return names.join(', ');
  return `${names.slice(0, 20).join(', ')}, … ${names.length - 24} more …, ${names.slice(-4).join(', ')}`;
}

function targetText(t: WatchTarget): string {
  switch (t.kind) {
    case 'node':
      return `voltage of node ${t.node} against ground`;
    case 'between':
      return `voltage of ${t.a} minus ${t.b}`;
    case 'part-voltage':
      return `voltage across ${t.part}`;
    case 'part-current':
      return `current through ${t.part}`;
  }
}

function watchRow(w: Watch): string[] {
  const above = w.threshold === undefined ? '' : `, time above ${formatSIExact(w.threshold, w.unit)}`;
  return [w.label, `(${w.unit})`, targetText(w.target) + above];
}

/** Reference direction of a part in words. */
function direction(kind: Circuit['parts'][number]['kind'], a: string, b: string): string {
  if (kind === 'voltage-source') return `value is v(${a}) − v(${b})`;
  if (kind === 'current-source') return `drives current from ${a} through itself to ${b}`;
  return `v = v(${a}) − v(${b}), i flows ${a} → ${b}`;
}

/** What `ringdown check` prints: the elaborated circuit with every value in SI. */
export function formatCheck(circuit: Circuit): string {
  const out: string[] = [];
  const title = `ringdown check: ${circuit.file}${circuit.title ? ` (${circuit.title})` : ''}`;
  out.push(title, '═'.repeat(Math.min(80, [...title].length)), '');

  out.push(...heading('Nodes'));
  out.push(`  ${[...circuit.nodes, 'gnd (ground, 0 V)'].join(', ')}`, '');

  const passives = circuit.parts.filter((p) => !isSource(p));
  const sources = circuit.parts.filter(isSource);
  out.push(...heading('Parts'));
  if (passives.length === 0) out.push('  (none)');
  out.push(
    ...table(
      passives.map((p) => [
        p.name,
        kindName(p),
        `${p.a} -> ${p.b}`,
        p.kind === 'switch' ? describeSwitching(p) : formatSIExact(p.value, partUnit(p)),
        p.initial !== undefined ? `initial ${formatSIExact(p.initial, p.kind === 'capacitor' ? 'V' : 'A')}` : '',
        direction(p.kind, p.a, p.b),
        describeRatings(p),
      ]),
    ),
  );
  out.push('');

  out.push(...heading('Sources'));
  if (sources.length === 0) out.push('  (none)');
  for (const s of sources) {
    out.push(`  ${s.name}  ${kindName(s)}  ${s.a} -> ${s.b}  (${direction(s.kind, s.a, s.b)})`);
    for (const term of s.waveform?.terms ?? []) out.push(`      + ${describeWaveform({ terms: [term] }, partUnit(s))}`);
  }
  out.push('');

  out.push(...heading('Watches'));
  out.push(...(circuit.watches.length > 0 ? table(circuit.watches.map(watchRow)) : ['  (none)']), '');

  const a = circuit.analysis;
  out.push(...heading('Analysis'));
  out.push(`  span: ${a.span === undefined ? 'chosen from the slowest mode' : formatSI(a.span, 's', { digits: 6, trim: true })}`);
  out.push(`  samples: ${a.samples}`);
  if (a.derating !== undefined && circuit.parts.some((p) => p.ratings)) out.push(`  derating: parts flagged above ${formatPlain(a.derating * 100, 4)} % of a rating`);
  out.push(`  before t = 0: ${a.start === 'rest' ? 'every capacitor and inductor at zero' : 'settled at the DC operating point'} (a part's own initial value overrides)`);
  out.push(`  settling band: ${a.settle.kind === 'relative' ? `±${formatPlain(a.settle.fraction * 100, 6)} % of the transition` : `±${formatSIExact(a.settle.value, '')} (same unit as each signal)`}`);
  const params = Object.entries(circuit.params);
  if (params.length > 0) out.push(`  parameters: ${params.map(([k, v]) => `${k} = ${formatSIExact(v, '')}`).join(', ')}`);
  out.push('');

  // the state count from the circuit's graph, with each capacitor loop and inductor cut-set that
  // takes a state away explained (at t = 0 and, with switches, after the last event)
  const times = circuit.parts.some((p) => p.kind === 'switch') ? [0, Infinity] : [0];
  for (const at of times) {
    const st = describeStructure(circuit, { at });
    out.push(...heading(at === 0 ? (times.length > 1 ? 'States (switches as at t = 0)' : 'States') : 'States (switches as after the last event)'));
    out.push(`  ${st.summary}`);
    if (st.stateNames.length > 0) out.push(...wrapWords(`  state variables: ${shortList(st.stateNames)}`, 80, '    '));
    // each part with the line it is declared on, so the loop can be found in the file
    const line = (name: string): string => {
      const part = circuit.parts.find((p) => p.name === name);
      return part ? `${name} (line ${part.loc.line})` : name;
    };
    for (const loop of st.capacitorLoops) out.push(`  - loop ${loop.parts.map(line).join(' → ')}: ${loop.explanation}`);
    for (const cut of st.inductorCutSets) out.push(`  - cut-set ${cut.parts.map(line).join(', ')}: ${cut.explanation}`);
    out.push('');
  }

  const warnings = circuit.warnings ?? [];
  out.push(...heading('Warnings'));
  out.push(...(warnings.length > 0 ? warnings.map((w) => `  - ${warningLine(w)}`) : ['  none']));
  return out.join('\n') + '\n';
}
