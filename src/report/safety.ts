/** The standing safety notice printed at the end of every run report (lines within 80 columns). */
export const SAFETY_NOTICE = [
  'Safety: these results come from an idealized lumped model: ideal parts with no',
  'ESR, ESL, leakage, saturation, arcing or other parasitics. Real hardware behaves',
  'differently. Hazardous voltages, energy stored in capacitors and inductors, and',
  'inductive kickback can injure or kill. Follow your local electrical codes and',
  'licensed practice, and verify on the bench with suitable precautions before',
  'relying on any number here.',
];
