/**
 * Example data for figure tests and the README images: seeded simulations from src/physics
 * (invented scenarios, for demos only) and FitResults built at the true parameters with the
 * Fisher-information covariance, so the figures do not depend on the fitter's iterations.
 */
import type { FitParameter, FitResult } from "../../src/fit/types.js";
import { goodnessOfFit } from "../../src/fit/goodness.js";
import type { Model } from "../../src/physics/model.js";
import { getModel } from "../../src/physics/registry.js";
import { paramVector, pixelPositions, simulateProfile } from "../../src/physics/simulate.js";
import type { Profile } from "../../src/profile.js";
import type { LabelledFit } from "../../src/report/comparisonTable.js";
import type { ProfileCurve } from "../../src/fit/profileCurve.js";

/** B1-like truth (shared/bench/PROBLEMS.md), on a shorter 1024-pixel line with 11 µm pitch. */
export const TWO_SLIT_TRUTH = {
  amplitude: 40000, // coherent peak (mean level 20000 as in the snapshots)
  background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3,
  visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1,
};

/** A "result" of `model` at `truth` for `profile`: model, Pearson residuals, Fisher covariance. */
export function resultAt(model: Model, profile: Profile, truth: Record<string, number>, free: string[]): FitResult {
  const params = paramVector(model, truth);
  const n = profile.x.length;
  const f = new Float64Array(n);
  model.evaluate(profile.x, params, f);
  const sigma = (i: number) => profile.sigma?.[i] ?? Math.sqrt(Math.max(f[i], 1));
  const used = (i: number) => !profile.mask || profile.mask[i] === 1;
  const k = free.length;
  const idx = free.map((name) => model.parameters.findIndex((p) => p.name === name));
  // Jacobian by central differences (fixture only; the fitter has its own).
  const jac = idx.map((j) => {
    const h = Math.max(Math.abs(params[j]) * 1e-6, 1e-12);
    const plus = new Float64Array(n), minus = new Float64Array(n);
    const saved = params[j];
    params[j] = saved + h; model.evaluate(profile.x, params, plus);
    params[j] = saved - h; model.evaluate(profile.x, params, minus);
    params[j] = saved;
    return plus.map((v, i) => (v - minus[i]) / (2 * h));
  });
  const fisher = new Float64Array(k * k);
  let chi2 = 0, nUsed = 0, logL = 0;
  const residuals = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    residuals[i] = used(i) ? (profile.y[i] - f[i]) / sigma(i) : NaN;
    if (!used(i)) continue;
    nUsed++;
    chi2 += residuals[i] ** 2;
    logL += -0.5 * residuals[i] ** 2 - Math.log(sigma(i) * Math.sqrt(2 * Math.PI));
    for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) fisher[a * k + b] += (jac[a][i] * jac[b][i]) / sigma(i) ** 2;
  }
  const covariance = invert(fisher, k);
  const correlation = covariance.map((c, ab) => c / Math.sqrt(covariance[Math.floor(ab / k) * (k + 1)] * covariance[(ab % k) * (k + 1)]));
  const parameters: FitParameter[] = model.parameters.map((spec, j) => {
    const a = idx.indexOf(j);
    return {
      name: spec.name, unit: spec.unit, value: params[j], uncertainty: a < 0 ? 0 : Math.sqrt(covariance[a * (k + 1)]),
      fixed: a < 0, tied: null, atBound: null, lower: spec.lower, upper: spec.upper,
    };
  });
  return {
    modelId: model.id, noise: "gaussian", converged: true, reason: "converged-step", message: "step size below tolerance",
    iterations: 0, evaluations: 1, jacobianEvaluations: 1, parameters, freeNames: free, covariance, correlation,
    covarianceScaled: false,
    statistics: {
      n: nUsed, nFree: k, dof: nUsed - k, chi2, reducedChi2: chi2 / (nUsed - k), objective: chi2, logLikelihood: logL,
      aic: 2 * k - 2 * logL, aicc: 2 * k - 2 * logL + (2 * k * (k + 1)) / (nUsed - k - 1), bic: k * Math.log(nUsed) - 2 * logL,
    },
    warnings: [], model: f, residuals, flagged: [], goodness: goodnessOfFit(NaN, 0, false),
  };
}

/** Gauss–Jordan inverse of a small symmetric positive-definite matrix (fixture only). */
function invert(m: Float64Array, k: number): Float64Array {
  const a = Float64Array.from(m);
  const inv = new Float64Array(k * k);
  for (let i = 0; i < k; i++) inv[i * k + i] = 1;
  for (let c = 0; c < k; c++) {
    const pivot = a[c * k + c];
    for (let j = 0; j < k; j++) { a[c * k + j] /= pivot; inv[c * k + j] /= pivot; }
    for (let r = 0; r < k; r++) {
      if (r === c) continue;
      const factor = a[r * k + c];
      for (let j = 0; j < k; j++) { a[r * k + j] -= factor * a[c * k + j]; inv[r * k + j] -= factor * inv[c * k + j]; }
    }
  }
  return inv;
}

const TWO_SLIT_FREE = ["amplitude", "background", "center", "separation", "width", "visibility", "phase"];

/** A two-slit profile (Poisson counts, seed 7) with 24 saturated-looking pixels masked, and its result. */
export function fitExample(): { profile: Profile; result: FitResult } {
  const model = getModel("two-slit");
  const x = pixelPositions(1024, 11e-6);
  const profile: Profile = simulateProfile(model, TWO_SLIT_TRUTH, x, { noise: "poisson", seed: 7 });
  profile.sigma = profile.y.map((v) => Math.sqrt(Math.max(v, 1)));
  profile.mask = new Uint8Array(x.length).fill(1);
  for (let i = 600; i < 624; i++) profile.mask[i] = 0;
  return { profile, result: resultAt(model, profile, TWO_SLIT_TRUTH, TWO_SLIT_FREE) };
}

/** The same profile "fitted" by the far-field model and by a worse one (visibility forced to 0.80). */
export function comparisonExample(): { profile: Profile; fits: LabelledFit[] } {
  const { profile, result } = fitExample();
  const model = getModel("two-slit");
  const worse = resultAt(model, profile, { ...TWO_SLIT_TRUTH, visibility: 0.8, width: 0.104e-3 }, TWO_SLIT_FREE);
  return { profile, fits: [{ label: "far field, V free", result }, { label: "far field, V = 0.80", result: worse }] };
}

/** A coherence scan: visibility at 9 slit separations for a 0.4 mm disc source at 1 m (σ = 0.02). */
export function coherenceExample(): { scan: Profile; result: FitResult; model: Model } {
  const model = getModel("coherence-disc");
  const truth = { visibility: 0.95, diameter: 0.4e-3, sourceDistance: 1, wavelength: 632.8e-9 };
  const x = Float64Array.from({ length: 9 }, (_, i) => 0.2e-3 + i * 0.2e-3);
  const scan: Profile = simulateProfile(model, truth, x, { noise: "gaussian", sigma: 0.02, seed: 3, yUnit: "1" });
  return { scan, result: resultAt(model, scan, truth, ["visibility", "diameter"]), model };
}

/** Parabolic-with-skew profile curves for two parameters (invented shapes for the figure test). */
export function profileCurvesExample(): ProfileCurve[] {
  const curve = (name: string, unit: string, best: number, se: number, skew: number): ProfileCurve => {
    const values = Float64Array.from({ length: 21 }, (_, i) => best + ((i - 10) / 10) * 3 * se);
    const delta = values.map((v) => { const t = (v - best) / se; return t * t * (1 + skew * t); });
    return { name, unit, values, deltaObjective: delta, best, uncertainty: se };
  };
  return [curve("separation", "m", 0.5e-3, 0.4e-6, 0.05), curve("visibility", "1", 0.85, 0.004, -0.08)];
}
