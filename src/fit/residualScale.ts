/**
 * What a normalised residual is divided by, in one place for the fitter's reports, the paper
 * figures and the explorer's live preview (so all three show the same numbers and label).
 * Pearson residuals (y − f)/s with s: √f for the Poisson model (its variance is the mean);
 * otherwise the given σ, or √max(y, 1) for integer counts, or 1 when nothing is known (then the
 * residual is y − f in the data's unit). Common practice for count data.
 */
import type { NoiseModelId } from "./types.js";

/** The scale of a residual: given σ, √model, √data (counts), or none (plain y − f). */
export type ResidualScale = "sigma" | "sqrt-model" | "sqrt-data" | "none";

/**
 * The scale the fitter uses for noise model `noise` ("auto" resolves as the fitter does:
 * Poisson for counts, else Gaussian) given whether the profile has σ and integer counts.
 */
export function residualScale(noise: NoiseModelId | "auto" | string, hasSigma: boolean, counts: boolean): ResidualScale {
  const id = noise === "auto" ? (counts ? "poisson" : "gaussian") : noise;
  if (id === "poisson") return "sqrt-model";
  if (hasSigma) return "sigma";
  if (counts) return "sqrt-data";
  // A robust fit of data without σ estimates one from its residuals (median absolute deviation).
  return id === "robust" ? "sigma" : "none";
}

/**
 * Residuals (y − f)/s into `out` (NaN where `used` is 0), with s as `scale` says.
 * @param sigma σ per point (same unit as y), needed for scale "sigma"
 */
export function scaledResiduals(
  y: ArrayLike<number>, f: ArrayLike<number>, sigma: ArrayLike<number> | null,
  scale: ResidualScale, used: ArrayLike<number>, out: Float64Array,
): Float64Array {
  for (let i = 0; i < y.length; i++) {
    if (used[i] !== 1) { out[i] = NaN; continue; }
    const s = scale === "sqrt-model" ? Math.sqrt(Math.max(f[i], 1e-300))
      : scale === "sigma" && sigma ? sigma[i]
      : scale === "sqrt-data" ? Math.sqrt(Math.max(y[i], 1)) : 1;
    out[i] = (y[i] - f[i]) / s;
  }
  return out;
}

/** Axis title of residuals on `scale` (plotly text): (I−f)/σ, (I−f)/√f, (I−f)/√I, or I−f. */
export function residualAxisTitle(scale: ResidualScale): string {
  switch (scale) {
    case "sigma": return "(<i>I</i>−<i>f</i>)/<i>σ</i>";
    case "sqrt-model": return "(<i>I</i>−<i>f</i>)/√<i>f</i>";
    case "sqrt-data": return "(<i>I</i>−<i>f</i>)/√<i>I</i>";
    default: return "<i>I</i>−<i>f</i>";
  }
}
