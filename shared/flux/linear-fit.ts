/**
 * Ordinary least-squares line χ(τ) = a + b·τ, τ = t − t0; the slope b is the rate used for the
 * flux (the reference method of closed-chamber work, REFERENCES.md §3a). Centred sums keep the
 * result exact to rounding for ppm-sized values.
 */
export interface LinearRaw {
  intercept: number;
  slope: number;
  rss: number;
}

export function fitLinearRaw(tau: ArrayLike<number>, y: ArrayLike<number>, n: number): LinearRaw | null {
  if (n < 2) return null;
  let mt = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mt += tau[i];
    my += y[i];
  }
  mt /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    const dt = tau[i] - mt;
    sxx += dt * dt;
    sxy += dt * (y[i] - my);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  const intercept = my - slope * mt;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i] - intercept - slope * tau[i];
    rss += r * r;
  }
  return { intercept, slope, rss };
}
