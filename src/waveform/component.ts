/**
 * One input's value on an interval as a sum of components
 *
 *   u(τ) = Re[(re + j·im)·τ^power·e^((sigma + j·omega)·τ)],   τ = t − t0,
 *
 * the family closed under convolution with the network's modes: constants, ramps, exponential
 * approaches, sinusoids (with or without decay), and their products.
 */
export interface Component {
  input: number;
  power: number;
  sigma: number;
  omega: number;
  re: number;
  im: number;
}

export function componentValue(k: Component, tau: number): number {
  // (e^0 = 1 and τ^1 = τ exactly: the shortcuts change no digit)
  const m = (k.sigma === 0 ? 1 : Math.exp(k.sigma * tau)) * (k.power === 0 ? 1 : k.power === 1 ? tau : tau ** k.power);
  if (k.omega === 0) return k.re * m;
  return m * (k.re * Math.cos(k.omega * tau) - k.im * Math.sin(k.omega * tau));
}

/** d/dτ of a component, as components. */
export function componentDerivative(k: Component): Component[] {
  const out: Component[] = [];
  // s·c·τ^p·e^(sτ)
  const sre = k.sigma * k.re - k.omega * k.im;
  const sim = k.sigma * k.im + k.omega * k.re;
  if (sre !== 0 || sim !== 0) out.push({ ...k, re: sre, im: sim });
  if (k.power > 0) out.push({ ...k, power: k.power - 1, re: k.re * k.power, im: k.im * k.power });
  return out;
}
