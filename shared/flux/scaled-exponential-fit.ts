/**
 * Non-linear least squares for y = c · exp(θ·z), the common form of the Q10 model
 * (z = T − Tref, θ = ln Q10 / 10) and of Lloyd & Taylor (z = 1/(Tref − T0) − 1/(T − T0), θ = E0).
 * Fitting the fluxes themselves (not ln flux) keeps values near zero or below it usable.
 * As for closures, c is linear once θ is fixed, so the problem is a 1-D profile maximisation
 * φ(θ) = (Σ E y)² / Σ E², E = exp(θ z), solved by safeguarded Newton with a grid fallback.
 * Standard errors from s²·(JᵀJ)⁻¹ at the optimum (the usual asymptotic covariance of
 * non-linear least squares, as scipy's curve_fit and R's nls report it).
 */
export interface ScaledExponentialFit {
  c: number;
  theta: number;
  seC: number;
  seTheta: number;
  rss: number;
  n: number;
}

function profile(z: Float64Array, y: Float64Array, theta: number) {
  let A = 0,
    A1 = 0,
    A2 = 0,
    B = 0,
    B1 = 0,
    B2 = 0;
  for (let i = 0; i < z.length; i++) {
    const zi = z[i];
    const e = Math.exp(theta * zi);
    const ey = e * y[i];
    const ee = e * e;
    A += ey;
    A1 += zi * ey;
    A2 += zi * zi * ey;
    B += ee;
    B1 += 2 * zi * ee;
    B2 += 4 * zi * zi * ee;
  }
  const N = A * A,
    N1 = 2 * A * A1,
    N2 = 2 * (A1 * A1 + A * A2);
  const num1 = N1 * B - N * B1;
  return {
    phi: N / B,
    d1: num1 / (B * B),
    d2: (N2 * B - N * B2) / (B * B) - (2 * B1 * num1) / (B * B * B),
    c: A / B,
  };
}

/** Newton ascent in the standardised variable θ·sd(z); NaN when no interior maximum is found. */
function maximise(z: Float64Array, y: Float64Array, start: number): number {
  const LIMIT = 20;
  let th = Math.max(-LIMIT, Math.min(LIMIT, start));
  let cur = profile(z, y, th);
  for (let iter = 0; iter < 100; iter++) {
    let step = cur.d2 < 0 ? -cur.d1 / cur.d2 : Math.sign(cur.d1);
    step = Math.max(-2, Math.min(2, step));
    if (cur.d2 < 0 && Math.abs(step) < 1e-12 * (1 + Math.abs(th))) return th;
    let moved = false;
    for (let k = 0; k < 50; k++) {
      const t = Math.max(-LIMIT, Math.min(LIMIT, th + step));
      const trial = profile(z, y, t);
      if (Number.isFinite(trial.phi) && trial.phi >= cur.phi - 1e-14 * Math.abs(cur.phi)) {
        if (t === th) return cur.d2 < 0 ? th : NaN;
        th = t;
        cur = trial;
        moved = true;
        break;
      }
      step /= 2;
    }
    if (!moved) return cur.d2 < 0 ? th : NaN;
  }
  return NaN;
}

export function fitScaledExponential(zIn: readonly number[], yIn: readonly number[]): ScaledExponentialFit | null {
  const n = zIn.length;
  if (n < 3) return null;
  let mean = 0;
  for (const v of zIn) mean += v;
  mean /= n;
  let sd = 0;
  for (const v of zIn) sd += (v - mean) * (v - mean);
  sd = Math.sqrt(sd / n);
  if (!(sd > 0)) return null;
  const z = Float64Array.from(zIn, (v) => v / sd);
  const y = Float64Array.from(yIn);
  // First guess: log-linear regression on the positive values (ignored if too few).
  let start = 0;
  const pos = [...z.keys()].filter((i) => y[i] > 0);
  if (pos.length >= 3) {
    const mz = pos.reduce((s, i) => s + z[i], 0) / pos.length;
    const ml = pos.reduce((s, i) => s + Math.log(y[i]), 0) / pos.length;
    let sxy = 0,
      sxx = 0;
    for (const i of pos) {
      sxy += (z[i] - mz) * (Math.log(y[i]) - ml);
      sxx += (z[i] - mz) ** 2;
    }
    if (sxx > 0) start = sxy / sxx;
  }
  let th = maximise(z, y, start);
  if (!Number.isFinite(th) || Math.abs(th) >= 19.99) {
    let best = -Infinity;
    for (let g = -6; g <= 6; g += 0.5) {
      const p = profile(z, y, g);
      if (p.phi > best) {
        best = p.phi;
        th = g;
      }
    }
    th = maximise(z, y, th);
    if (!Number.isFinite(th) || Math.abs(th) >= 19.99) return null;
  }
  const c = profile(z, y, th).c;
  // Covariance in the original θ: J = [E, c·z·E] with z unscaled.
  let rss = 0,
    jcc = 0,
    jct = 0,
    jtt = 0;
  for (let i = 0; i < n; i++) {
    const zi = zIn[i];
    const e = Math.exp(th * z[i]);
    const r = y[i] - c * e;
    rss += r * r;
    jcc += e * e;
    jct += c * zi * e * e;
    jtt += c * c * zi * zi * e * e;
  }
  const det = jcc * jtt - jct * jct;
  const s2 = rss / (n - 2);
  return {
    c,
    theta: th / sd,
    seC: Math.sqrt((s2 * jtt) / det),
    seTheta: Math.sqrt((s2 * jcc) / det),
    rss,
    n,
  };
}
