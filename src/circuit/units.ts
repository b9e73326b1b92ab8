import { raise, type DiagnosticSink } from '../netlist/errors.js';
import type { SourceLocation } from '../netlist/location.js';
import { UNIT_NAMES, type Quantity, type Unit } from '../netlist/quantity.js';

/** What a place in a statement accepts. A value without a unit is accepted anywhere. */
export interface Place {
  /** "a capacitance" */
  what: string;
  units: readonly Unit[];
  example: string;
}

type PlaceName =
  | 'resistance' | 'capacitance' | 'inductance' | 'voltage' | 'current'
  | 'time' | 'voltageArea' | 'currentArea' | 'band' | 'count'
  | 'voltageRate' | 'currentRate' | 'frequency' | 'phase' | 'duty';

export const PLACES: Record<PlaceName, Place> = {
  resistance: { what: 'a resistance', units: ['Ω'], example: '4.7kΩ or 4k7' },
  capacitance: { what: 'a capacitance', units: ['F'], example: '470nF' },
  inductance: { what: 'an inductance', units: ['H'], example: '10mH' },
  voltage: { what: 'a voltage', units: ['V'], example: '12V' },
  current: { what: 'a current', units: ['A'], example: '10mA' },
  time: { what: 'a time', units: ['s'], example: '1ms' },
  voltageArea: { what: 'a voltage impulse area', units: ['Vs'], example: '2mVs' },
  currentArea: { what: 'a current impulse area', units: ['As'], example: '1uAs' },
  band: { what: 'a settling band', units: ['%', 'V', 'A'], example: '2% or 50mV' },
  count: { what: 'a whole number', units: [], example: '1001' },
  voltageRate: { what: 'a voltage rate', units: ['V/s'], example: '2kV/s' },
  currentRate: { what: 'a current rate', units: ['A/s'], example: '10mA/s' },
  frequency: { what: 'a frequency', units: ['Hz'], example: '50Hz' },
  phase: { what: 'a phase', units: ['deg', 'rad'], example: '90deg or 1.57rad' },
  duty: { what: 'a duty cycle', units: ['%'], example: '50%' },
};

function unitList(units: readonly Unit[]): string {
  return units.map((u) => UNIT_NAMES[u]).join(' or ');
}

/** Raises an error when the quantity's unit is not one the place accepts; returns whether it fits. */
export function checkUnit(sink: DiagnosticSink, q: Quantity, loc: SourceLocation, place: Place, subject: string): boolean {
  if (q.unit === null || place.units.includes(q.unit)) return true;
  const needs = place.units.length === 0 ? 'a plain number without a unit' : `${place.what} in ${unitList(place.units)}`;
  raise(sink, 'error', loc, `${subject} is given in ${UNIT_NAMES[q.unit]}, but needs ${needs}`, {
    expected: `${place.what} such as ${place.example}`,
  });
  return false;
}
