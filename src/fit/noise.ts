/**
 * Noise models as residual transforms r_i = g(y_i, f_i), so that Σ r_i² is the objective and
 * dr_i/df_i gives the Jacobian by the chain rule:
 *   gaussian  r = (y − f)/σ                                    (objective χ²)
 *   poisson   r = sign(y − f)·√(2[f − y + y ln(y/f)])          (objective: Poisson deviance,
 *             the Cash statistic up to a data-only constant; Cash 1979, ApJ 228:939; McCullagh &
 *             Nelder, Generalized Linear Models, 2nd ed., §2.4 deviance residuals)
 *   robust    r = sign(u)·c·√ρ(u²/c²), u = (y − f)/σ, ρ(z) = 2(√(1+z) − 1)  (soft-L1 loss)
 * Minimising Σ r² by Gauss–Newton/LM has the exact gradient of the objective, so the optimum
 * is the maximum-likelihood (or minimum-loss) point.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Profile } from "../profile.js";
import { lnGamma } from "../math/gamma.js";
import type { NoiseModelId } from "./types.js";

/** Noise settings resolved for one profile (used points only). */
export interface NoiseSetup {
  id: NoiseModelId;
  /** σ per used point (gaussian/robust); 1 where unknown. */
  sigma: Float64Array;
  /** Where σ came from: the profile, √counts, or unknown (1). */
  sigmaSource: "given" | "counts" | "unknown";
  /** Soft-L1 scale c in units of σ (robust only). */
  robustScale: number;
}

/** Picks the noise model ("auto": poisson for integer counts, else gaussian) and σ of the used points. */
export function resolveNoise(profile: Profile, used: Int32Array, requested: NoiseModelId | "auto" | undefined, robustScale = 2): NoiseSetup {
  const id: NoiseModelId = requested === undefined || requested === "auto" ? (profile.counts ? "poisson" : "gaussian") : requested;
  if (id !== "gaussian" && id !== "poisson" && id !== "robust") {
    throw new InvalidArgumentError("noise", requested, `"gaussian", "poisson", "robust" or "auto"`);
  }
  if (!(robustScale > 0) || !Number.isFinite(robustScale)) throw new InvalidArgumentError("robustScale", robustScale, "a positive number (units of σ)");
  const sigma = new Float64Array(used.length).fill(1);
  let sigmaSource: NoiseSetup["sigmaSource"] = "unknown";
  if (profile.sigma) {
    sigmaSource = "given";
    for (let k = 0; k < used.length; k++) {
      const s = profile.sigma[used[k]];
      if (!(s > 0) || !Number.isFinite(s)) {
        throw new InvalidArgumentError(`profile.sigma[${used[k]}]`, s, "a finite σ > 0 at every used point; mask the point or fix σ");
      }
      sigma[k] = s;
    }
  } else if (profile.counts) {
    sigmaSource = "counts";
    for (let k = 0; k < used.length; k++) sigma[k] = Math.sqrt(Math.max(profile.y[used[k]], 1));
  }
  if (id === "poisson") {
    for (let k = 0; k < used.length; k++) {
      const y = profile.y[used[k]];
      if (!(y >= 0)) throw new InvalidArgumentError(`profile.y[${used[k]}]`, y, "counts >= 0 for the poisson noise model; use noise: \"gaussian\" for background-subtracted data");
    }
  }
  return { id, sigma, sigmaSource, robustScale };
}

/**
 * Residuals and their derivatives by the model value: writes r (length n) and dr/df (when given).
 * @param y data (used points), f model values, setup from resolveNoise
 */
export function noiseResiduals(setup: NoiseSetup, y: Float64Array, f: Float64Array, r: Float64Array, drdf?: Float64Array): void {
  const n = y.length;
  const sigma = setup.sigma;
  if (setup.id === "gaussian") {
    for (let i = 0; i < n; i++) {
      r[i] = (y[i] - f[i]) / sigma[i];
      if (drdf) drdf[i] = -1 / sigma[i];
    }
  } else if (setup.id === "poisson") {
    for (let i = 0; i < n; i++) {
      const yi = y[i], fi = f[i];
      if (!(fi > 0)) {
        // f = 0 is allowed only where y = 0 (zero deviance); negative means are impossible.
        r[i] = fi === 0 && yi === 0 ? 0 : NaN;
        if (drdf) drdf[i] = fi === 0 && yi === 0 ? 0 : NaN;
        continue;
      }
      const half = fi - yi + (yi > 0 ? yi * Math.log(yi / fi) : 0);
      const d = Math.sqrt(2 * Math.max(half, 0));
      const signed = yi >= fi ? d : -d;
      r[i] = signed;
      if (drdf) {
        // dr/df = (1 − y/f)/r; near r = 0 its limit is −1/√f.
        drdf[i] = Math.abs(signed) > 1e-6 * Math.sqrt(fi) ? (1 - yi / fi) / signed : -1 / Math.sqrt(fi);
      }
    }
  } else {
    const c = setup.robustScale;
    for (let i = 0; i < n; i++) {
      const u = (y[i] - f[i]) / sigma[i];
      const z = (u / c) * (u / c);
      const root = Math.sqrt(1 + z);
      const rt = c * Math.sqrt(2 * (root - 1));
      const signed = u >= 0 ? rt : -rt;
      r[i] = signed;
      // d(r̃)/du = u / (r̃ √(1+z)), → 1 as u → 0.
      if (drdf) drdf[i] = -(Math.abs(u) > 1e-8 ? u / (signed * root) : 1) / sigma[i];
    }
  }
}

/**
 * Full log-likelihood at the optimum (natural log, constants included), for AIC/BIC.
 * gaussian with absolute σ: −½Σ[((y−f)/σ)² + ln(2πσ²)];
 * gaussian with relative σ (scale s² = χ²/n estimated by maximum likelihood): −½[n ln(2π) + Σ ln σ² + n ln(χ²/n) + n];
 * poisson: Σ[y ln f − f − ln Γ(y+1)];
 * robust: the gaussian form with Σ r̃² in place of χ² (a pseudo-likelihood, comparable between robust fits only).
 */
export function logLikelihood(setup: NoiseSetup, y: Float64Array, f: Float64Array, objective: number, chi2: number, sigmaAbsolute: boolean): number {
  const n = y.length;
  if (setup.id === "poisson") {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += (y[i] > 0 ? y[i] * Math.log(f[i]) : 0) - f[i] - lnGamma(y[i] + 1);
    return sum;
  }
  let logSigma2 = 0;
  for (let i = 0; i < n; i++) logSigma2 += Math.log(setup.sigma[i] * setup.sigma[i]);
  const q = setup.id === "robust" ? objective : chi2;
  if (sigmaAbsolute && setup.id === "gaussian") return -0.5 * (q + n * Math.log(2 * Math.PI) + logSigma2);
  return -0.5 * (n * Math.log(2 * Math.PI) + logSigma2 + n * Math.log(Math.max(q, 1e-300) / n) + n);
}
