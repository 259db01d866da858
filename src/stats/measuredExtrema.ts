/**
 * Positions of the measured maxima and minima: a weighted cubic y ≈ c0 + c1 t + c2 t² + c3 t³
 * (t = x − x̂) fitted by linear least squares to the data within ± Λ/6 of each extremum the
 * fit predicts; the extremum is the stationary point nearest x̂, with u from the cubic's
 * covariance (linear propagation, GUM §5.1.2), scaled by √(χ²/ν) when the local scatter
 * exceeds the weights.
 */
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import { fringeLayoutOf } from "./fitParameters.js";
import { invertMatrix } from "./linearLeastSquares.js";
import type { Calibration, DerivedQuantity } from "./quantity.js";

/** One measured maximum or minimum (position in m). */
export interface Extremum {
  kind: "maximum" | "minimum";
  /** Fringe order: m for maxima, m + ½ for minima. */
  order: number;
  position: DerivedQuantity;
  /** Points used in the local parabola. */
  points: number;
}

/**
 * Measured maxima and minima of `profile` near those predicted by `fit` (model with center,
 * separation, wavelength, distance and optionally phase). Positions in m, scaled by the
 * detector scale; u includes the pixel-pitch calibration. Extrema with fewer than 5 points or
 * a parabola of the wrong curvature are skipped.
 */
export function measuredExtrema(profile: Profile, fit: FitResult, calibration: Calibration = {}): Extremum[] {
  const { center, separation: d, wavelength: lambda, distance, phase } = fringeLayoutOf(profile, fit, "measured extrema");
  const spacing = (lambda * distance) / d;
  const half = spacing / 6;
  const x = profile.x;
  const xMin = x[0];
  const xMax = x[x.length - 1];
  const relScale = calibration.pixelPitchRelative ?? 0;
  const out: Extremum[] = [];
  const first = Math.floor((xMin - center) / spacing + phase / (2 * Math.PI)) * 2;
  const last = Math.ceil((xMax - center) / spacing + phase / (2 * Math.PI)) * 2;
  for (let twice = first; twice <= last; twice++) {
    const order = twice / 2;
    const s = ((order - phase / (2 * Math.PI)) * lambda) / d;
    if (Math.abs(s) >= 1) continue;
    const predicted = center + (distance * s) / Math.sqrt(1 - s * s);
    if (predicted - half < xMin || predicted + half > xMax) continue;
    const vertex = localVertex(profile, predicted, half);
    const kind = twice % 2 === 0 ? "maximum" : "minimum";
    if (!vertex || (kind === "maximum") !== vertex.curvature < 0) continue;
    const value = vertex.position;
    const uncertainty = Math.sqrt(vertex.variance + (value * relScale) ** 2);
    out.push({ kind, order, points: vertex.points, position: { name: `${kind} ${order}`, value, uncertainty, unit: "m", note: "stationary point of a local cubic" } });
  }
  return out;
}

function localVertex(profile: Profile, x0: number, half: number): { position: number; variance: number; curvature: number; points: number } | undefined {
  // Weighted cubic y ≈ Σ c_j t^j in t = (x − x0)/half: the cubic term absorbs the envelope's
  // slope, which would otherwise shift a parabola's vertex.
  const p = 4;
  const normal = new Float64Array(p * p);
  const rhs = new Float64Array(p);
  const used: [number, number, number][] = [];
  for (let i = 0; i < profile.x.length; i++) {
    const t = (profile.x[i] - x0) / half;
    if (t < -1 || t > 1 || (profile.mask && !profile.mask[i])) continue;
    const y = profile.y[i];
    const sigma = profile.sigma ? profile.sigma[i] : profile.counts ? Math.sqrt(Math.max(y, 1)) : 1;
    const w = 1 / (sigma * sigma);
    for (let a = 0; a < p; a++) {
      rhs[a] += w * t ** a * y;
      for (let b = 0; b < p; b++) normal[a * p + b] += w * t ** (a + b);
    }
    used.push([t, y, w]);
  }
  const n = used.length;
  if (n < p + 3) return undefined;
  const inverse = invertMatrix(normal, p);
  if (!inverse) return undefined;
  const coef = Array.from({ length: p }, (_, a) => inverse.slice(a * p, a * p + p).reduce((sum, v, b) => sum + v * rhs[b], 0));
  let chi2 = 0;
  for (const [t, y, w] of used) chi2 += w * (y - coef.reduce((sum, c, j) => sum + c * t ** j, 0)) ** 2;
  // Unknown σ (a.u. data without sigma): always scale; known σ: scale only upward.
  const known = Boolean(profile.sigma) || profile.counts;
  const factor = known ? Math.max(1, chi2 / (n - p)) : chi2 / (n - p);
  const root = (c: number[]) => stationaryPoint(c[1], c[2], c[3]);
  const tStar = root(coef);
  if (!Number.isFinite(tStar) || Math.abs(tStar) > 1) return undefined;
  // Gradient of t* with respect to the coefficients by central differences, then gᵀ C g.
  const gradient = coef.map((c, j) => {
    const h = 1e-6 * Math.max(Math.abs(c), Math.sqrt(inverse[j * p + j]));
    const up = coef.slice(); up[j] += h;
    const down = coef.slice(); down[j] -= h;
    return (root(up) - root(down)) / (2 * h);
  });
  let variance = 0;
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) variance += gradient[a] * inverse[a * p + b] * gradient[b];
  const curvature = 2 * coef[2] + 6 * coef[3] * tStar;
  return { position: x0 + tStar * half, variance: factor * variance * half * half, curvature, points: n };
}

/** Root of b + 2c t + 3d t² = 0 nearest t = 0 (NaN when none is real). */
function stationaryPoint(b: number, c: number, d: number): number {
  if (Math.abs(3 * d) < 1e-12 * Math.abs(c)) return -b / (2 * c);
  const disc = c * c - 3 * d * b;
  if (disc < 0) return NaN;
  // Stable form of the smaller root (common practice for quadratics).
  const q = -(c + Math.sign(c || 1) * Math.sqrt(disc));
  const r1 = q / (3 * d);
  const r2 = b / q;
  return Math.abs(r1) < Math.abs(r2) ? r1 : r2;
}
