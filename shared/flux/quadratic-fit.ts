/**
 * Quadratic regression χ(τ) = b0 + b1·τ + b2·τ², initial slope b1 at τ = 0
 * (Wagner, Reicosky & Alessi 1997, Agron. J. 89:279–284). Solved on s = τ/τmax ∈ [0, 1] so
 * that the 3×3 normal equations stay well conditioned whatever the closure length.
 */
export interface QuadraticRaw {
  b0: number;
  b1: number;
  b2: number;
  rss: number;
}

export function fitQuadraticRaw(tau: ArrayLike<number>, y: ArrayLike<number>, n: number, tauMax: number): QuadraticRaw | null {
  if (n < 4 || !(tauMax > 0)) return null;
  let my = 0;
  for (let i = 0; i < n; i++) my += y[i];
  my /= n;
  let s1 = 0,
    s2 = 0,
    s3 = 0,
    s4 = 0,
    ys0 = 0,
    ys1 = 0,
    ys2 = 0;
  for (let i = 0; i < n; i++) {
    const s = tau[i] / tauMax;
    const ss = s * s;
    const yc = y[i] - my;
    s1 += s;
    s2 += ss;
    s3 += ss * s;
    s4 += ss * ss;
    ys0 += yc;
    ys1 += yc * s;
    ys2 += yc * ss;
  }
  const c = solve3([n, s1, s2, s1, s2, s3, s2, s3, s4], [ys0, ys1, ys2]);
  if (!c) return null;
  const b0 = c[0] + my;
  const b1 = c[1] / tauMax;
  const b2 = c[2] / (tauMax * tauMax);
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const t = tau[i];
    const r = y[i] - (b0 + t * (b1 + t * b2));
    rss += r * r;
  }
  return { b0, b1, b2, rss };
}

/** Gaussian elimination with partial pivoting on a row-major 3×3 system; null if singular. */
function solve3(m: number[], rhs: number[]): [number, number, number] | null {
  const a = m.slice();
  const b = rhs.slice();
  for (let col = 0; col < 3; col++) {
    let piv = col;
    for (let r = col + 1; r < 3; r++) if (Math.abs(a[r * 3 + col]) > Math.abs(a[piv * 3 + col])) piv = r;
    if (!(Math.abs(a[piv * 3 + col]) > 1e-14 * Math.max(1, Math.abs(a[0])))) return null;
    if (piv !== col) {
      for (let k = 0; k < 3; k++) {
        const tmp = a[col * 3 + k];
        a[col * 3 + k] = a[piv * 3 + k];
        a[piv * 3 + k] = tmp;
      }
      const tb = b[col];
      b[col] = b[piv];
      b[piv] = tb;
    }
    for (let r = col + 1; r < 3; r++) {
      const f = a[r * 3 + col] / a[col * 3 + col];
      for (let k = col; k < 3; k++) a[r * 3 + k] -= f * a[col * 3 + k];
      b[r] -= f * b[col];
    }
  }
  const x2 = b[2] / a[8];
  const x1 = (b[1] - a[5] * x2) / a[4];
  const x0 = (b[0] - a[1] * x1 - a[2] * x2) / a[0];
  return [x0, x1, x2];
}
