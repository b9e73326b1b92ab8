import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { errors, lines, problems } from './helpers.js';

describe('topology checks', () => {
  it('finds an island with no path to gnd and names its nodes and parts', () => {
    const es = errors(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> gnd 1k', 'resistor R2 x -> y 1k', 'capacitor C2 y -> x 1u', 'watch node in'));
    expect(es).toHaveLength(1);
    expect(es[0]!.message).toBe("nodes 'x', 'y' ('R2', 'C2') have no connection to gnd");
    expect(es[0]!.loc!.line).toBe(3);
  });

  it('explains a circuit that never mentions gnd', () => {
    const es = errors(lines('voltage-source V1 a -> b 5V', 'resistor R1 a -> b 1k', 'watch node a'));
    expect(es[0]!.message).toMatch(/nothing connects to gnd: nodes 'a', 'b'/);
    expect(es[0]!.hint).toMatch(/connect one of these nodes to gnd/);
  });

  it('rejects a loop made only of voltage sources, naming each', () => {
    const es = errors(
      lines('voltage-source V1 a -> gnd 5V', 'voltage-source V2 a -> b 1V', 'resistor R1 b -> gnd 1k', 'voltage-source V3 b -> gnd 2V', 'watch node a'),
    );
    expect(es).toHaveLength(1);
    expect(es[0]!.message).toBe("voltage sources 'V1', 'V2', 'V3' form a loop with no other part in it");
    expect(es[0]!.loc!.line).toBe(4);
  });

  it('rejects two voltage sources in parallel', () => {
    const es = errors(lines('voltage-source V1 a -> gnd 5V', 'voltage-source V2 gnd -> a 1V', 'resistor R1 a -> gnd 1k', 'watch node a'));
    expect(es[0]!.message).toMatch(/'V1', 'V2' form a loop/);
  });

  it('rejects nodes reached only through current sources', () => {
    const es = errors(
      lines('current-source I1 gnd -> c 1mA', 'current-source I2 c -> d 1mA', 'resistor R1 d -> gnd 1k', 'resistor R2 c -> e 1k', 'watch node d'),
    );
    expect(es).toHaveLength(1);
    expect(es[0]!.message).toBe("nodes 'c', 'e' are reached only through current sources 'I1', 'I2'");
  });

  it('rejects a current source with no return path', () => {
    const es = errors(lines('current-source I1 gnd -> a 1mA', 'capacitor C1 a -> b 1u', 'watch node a'));
    expect(es[0]!.message).toMatch(/'a', 'b' are reached only through current source 'I1'/);
    expect(es[0]!.hint).toMatch(/the current of I1 has nowhere to go/);
  });

  it('warns about a node with a single connection but still loads', () => {
    const c = loadCircuit(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> gnd 1k', 'resistor R2 in -> ot 1k', 'watch node in'), 'w.rdn');
    expect(c.warnings).toHaveLength(1);
    expect(c.warnings![0]).toMatchObject({
      severity: 'warning',
      message: "node 'ot' is connected only to R2, so R2 carries no current",
      loc: { line: 3, col: 19, length: 2 },
    });
  });

  it('passes warnings along with errors when loading fails', () => {
    const ds = problems(lines('voltage-source V1 in -> gnd 5A', 'resistor R1 in -> gnd 1k', 'resistor R2 in -> x 1k', 'watch node in'));
    expect(ds.map((d) => d.severity)).toEqual(['error', 'warning']);
  });

  it('leaves capacitor loops and inductor cut-sets alone', () => {
    const ok = lines(
      'voltage-source V1 a -> gnd 5V',
      'capacitor C1 a -> gnd 1u',
      'current-source I1 gnd -> b 1mA',
      'inductor L1 b -> gnd 1m',
      'inductor L2 b -> gnd 2m',
      'watch node b',
    );
    expect(loadCircuit(ok, 'ok.rdn').parts).toHaveLength(5);
  });
});
