/**
 * Fresnel integrals C(x) = ∫₀ˣ cos(πt²/2) dt and S(x) = ∫₀ˣ sin(πt²/2) dt
 * (Abramowitz & Stegun 7.3.1–7.3.2).
 *
 * Method: for |x| < 1.6 the power series of ∫₀ˣ exp(iπt²/2) dt (A&S 7.3.11–7.3.12, summed
 * together); otherwise C + iS = (1 + i)/2 − x·exp(iπx²/2)·h(x), where h is the continued
 * fraction of the complementary error function (A&S 7.1.14, even form) evaluated by the
 * modified Lentz algorithm. Both parts are odd in x. Accuracy: about 1e-15 absolute and
 * better than 1e-13 relative wherever checked against mpmath (test/physics/fresnel.test.ts).
 */

/** Result slot of `fresnelCS`, so hot loops allocate nothing. */
export interface FresnelPair {
  c: number;
  s: number;
}

const SERIES_LIMIT = 1.6;
const TINY = 1e-300;

/**
 * Writes C(x) and S(x) (dimensionless; x dimensionless) into `out`.
 * @example const r = { c: 0, s: 0 }; fresnelCS(1, r); // r.c ≈ 0.7798934, r.s ≈ 0.4382591
 */
export function fresnelCS(x: number, out: FresnelPair): void {
  const ax = Math.abs(x);
  const sign = x < 0 ? -1 : 1;
  if (ax < SERIES_LIMIT) {
    seriesCS(ax, out);
  } else {
    continuedFractionCS(ax, out);
  }
  out.c *= sign;
  out.s *= sign;
}

/** C(x) = ∫₀ˣ cos(πt²/2) dt (dimensionless). */
export function fresnelC(x: number): number {
  const pair = { c: 0, s: 0 };
  fresnelCS(x, pair);
  return pair.c;
}

/** S(x) = ∫₀ˣ sin(πt²/2) dt (dimensionless). */
export function fresnelS(x: number): number {
  const pair = { c: 0, s: 0 };
  fresnelCS(x, pair);
  return pair.s;
}

/**
 * πx²/2 reduced modulo 2π without losing digits at large x (rad). x² is formed exactly as
 * a double-double (Dekker splitting), so exp(iπx²/2) stays accurate to ~1e-16 for any x
 * below 1e7, where π·x·x in plain doubles would carry a phase error of ~x²·1e-16.
 */
export function fresnelPhase(x: number): number {
  if (Math.abs(x) < 64) return 0.5 * Math.PI * x * x;
  const split = 134217729 * x; // 2^27 + 1
  const high = split - (split - x);
  const low = x - high;
  const square = x * x;
  const error = high * high - square + 2 * high * low + low * low; // x² = square + error exactly
  const quarter = square / 4; // πx²/2 = 2π · x²/4
  const turns = quarter - Math.floor(quarter) + error / 4;
  return 2 * Math.PI * turns;
}

/** Σ (iπ/2)ⁿ x^{2n+1} / (n!(2n+1)), x ≥ 0: real part → C, imaginary part → S. */
function seriesCS(x: number, out: FresnelPair): void {
  const w = 0.5 * Math.PI * x * x;
  let power = x; // (π x²/2)ⁿ x / n!
  let c = x;
  let s = 0;
  for (let n = 1; n < 60; n++) {
    power *= w / n;
    const term = power / (2 * n + 1);
    switch (n & 3) {
      case 0: c += term; break;
      case 1: s += term; break;
      case 2: c -= term; break;
      default: s -= term; break;
    }
    if (term < 1e-17 * Math.abs(n & 1 ? s : c)) break;
  }
  out.c = c;
  out.s = s;
}

/**
 * x ≥ SERIES_LIMIT. h = 1 / (b₀ − a₁/(b₁ − a₂/(b₂ − …))), b_k = 1 + 4k − iπx²,
 * a_k = (2k − 1)(2k); modified Lentz evaluation of b₀ + K(−a_k / b_k).
 */
function continuedFractionCS(x: number, out: FresnelPair): void {
  const pix2 = Math.PI * x * x;
  // f = b0, C = b0, D = 0
  let fr = 1;
  let fi = -pix2;
  let cr = fr;
  let ci = fi;
  let dr = 0;
  let di = 0;
  for (let k = 1; k < 300; k++) {
    const a = -(2 * k - 1) * (2 * k);
    const br = 1 + 4 * k;
    const bi = -pix2;
    // D = 1 / (b + a D)
    let tr = br + a * dr;
    let ti = bi + a * di;
    if (tr === 0 && ti === 0) tr = TINY;
    let inv = 1 / (tr * tr + ti * ti);
    dr = tr * inv;
    di = -ti * inv;
    // C = b + a / C
    inv = 1 / (cr * cr + ci * ci);
    cr = br + a * cr * inv;
    ci = bi - a * ci * inv;
    if (cr === 0 && ci === 0) cr = TINY;
    // f *= C D
    const er = cr * dr - ci * di;
    const ei = cr * di + ci * dr;
    const nr = fr * er - fi * ei;
    fi = fr * ei + fi * er;
    fr = nr;
    if (Math.abs(er - 1) + Math.abs(ei) < 1e-16) break;
  }
  // h = 1 / f
  const inv = 1 / (fr * fr + fi * fi);
  const hr = fr * inv;
  const hi = -fi * inv;
  // x · exp(iπx²/2) · h
  const phase = fresnelPhase(x);
  const er = Math.cos(phase) * x;
  const ei = Math.sin(phase) * x;
  out.c = 0.5 - (er * hr - ei * hi);
  out.s = 0.5 - (er * hi + ei * hr);
}
