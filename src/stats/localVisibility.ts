/**
 * Fringe visibility measured order by order: over two fringe periods around each maximum the
 * data are fitted by linear least squares with
 *   y − B(x) ≈ a0 + a1 t + a2 t² + (b + b1 t + b2 t²) cos(2πt/Λ) + (c + c1 t + c2 t²) sin(2πt/Λ),
 * the expanded form of a smooth envelope times (1 + V cos) to second order in t, with B(x) the
 * fitted background (background + backgroundSlope · x). V = √(b² + c²)/a0 at the window
 * centre, with u(V) from the coefficient covariance (GUM §5.1.2). The order m = d sin θ/λ is the path difference in
 * wavelengths at the window centre (Hecht, Optics, §9.3).
 */
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import { fringeLayoutOf } from "./fitParameters.js";
import { solveNormalEquations } from "./linearLeastSquares.js";

/** Visibility measured around one fringe maximum. */
export interface LocalVisibility {
  /** Path difference in wavelengths at the window centre (1). */
  order: number;
  /** Window centre (m). */
  position: number;
  visibility: number;
  uncertainty: number;
  points: number;
}

/**
 * Visibility around each fringe maximum with two full periods inside the profile, from the fringe positions the fit
 * predicts (model with center, separation, wavelength, distance, optionally phase).
 * Feed the result to bandwidthFromVisibilityDecay to get a bandwidth from the raw profile.
 */
export function localVisibilities(profile: Profile, fit: FitResult): LocalVisibility[] {
  const { center, separation: d, wavelength: lambda, distance, phase } = fringeLayoutOf(profile, fit, "local visibilities");
  const background = fit.parameters.find((p) => p.name === "background")?.value ?? 0;
  const slope = fit.parameters.find((p) => p.name === "backgroundSlope")?.value ?? 0;
  const x = profile.x;
  const out: LocalVisibility[] = [];
  const spacing = (lambda * distance) / d;
  const first = Math.floor((x[0] - center) / spacing) - 1;
  const last = Math.ceil((x[x.length - 1] - center) / spacing) + 1;
  for (let m = first; m <= last; m++) {
    const s = ((m - phase / (2 * Math.PI)) * lambda) / d;
    if (Math.abs(s) >= 1) continue;
    const c = Math.sqrt(1 - s * s);
    const x0 = center + (distance * s) / c;
    // Local period on the detector: Λ_local = λ L / (d cos³θ) for exact geometry.
    const period = spacing / (c * c * c);
    if (x0 - period < x[0] || x0 + period > x[x.length - 1]) continue;
    const rows: number[][] = [];
    const ys: number[] = [];
    const ws: number[] = [];
    for (let i = 0; i < x.length; i++) {
      const t = (x[i] - x0) / period;
      if (t < -1 || t >= 1 || (profile.mask && !profile.mask[i])) continue;
      const y = profile.y[i];
      const sigma = profile.sigma ? profile.sigma[i] : profile.counts ? Math.sqrt(Math.max(y, 1)) : 1;
      const cos = Math.cos(2 * Math.PI * t);
      const sin = Math.sin(2 * Math.PI * t);
      rows.push([1, t, t * t, cos, sin, t * cos, t * sin, t * t * cos, t * t * sin]);
      ys.push(y - background - slope * x[i]);
      ws.push(1 / (sigma * sigma));
    }
    if (rows.length < 20) continue;
    const fitLocal = solveNormalEquations(rows, ys, ws, !(profile.sigma || profile.counts));
    if (!fitLocal) continue;
    const [a0, , , b, cc] = fitLocal.coefficients;
    const amplitude = Math.hypot(b, cc);
    if (!(a0 > 0) || amplitude === 0) continue;
    const visibility = amplitude / a0;
    // Gradient of V = √(b² + c²)/a0 with respect to (a0, a1, a2, b, c, b1, c1, b2, c2).
    const g = [-visibility / a0, 0, 0, b / (amplitude * a0), cc / (amplitude * a0), 0, 0, 0, 0];
    const p = g.length;
    let variance = 0;
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) variance += g[i] * fitLocal.covariance[i * p + j] * g[j];
    out.push({ order: (d * s) / lambda, position: x0, visibility, uncertainty: Math.sqrt(variance), points: rows.length });
  }
  return out;
}
