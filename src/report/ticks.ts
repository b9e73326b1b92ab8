/** A "nice" step (1, 2 or 5 × 10^k) that splits `range` into at most `maxSteps` parts. */
export function niceStep(range: number, maxSteps: number): number {
  if (!(range > 0) || !Number.isFinite(range)) return 1;
  const raw = range / Math.max(1, maxSteps);
  const mag = 10 ** Math.floor(Math.log10(raw));
  for (const f of [1, 2, 5, 10]) if (f * mag >= raw * (1 - 1e-12)) return f * mag;
  return 10 * mag;
}

/** Tick values k·step inside [start, end]. */
export function niceTicks(start: number, end: number, maxSteps: number): number[] {
  const step = niceStep(end - start, maxSteps);
  const first = Math.ceil(start / step - 1e-9);
  const ticks: number[] = [];
  for (let k = first; k * step <= end + step * 1e-9; k++) ticks.push(k * step === 0 ? 0 : k * step);
  return ticks;
}
