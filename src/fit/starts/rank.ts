/**
 * Ranking of candidate starts: each candidate's linear parameters (the overall scale —
 * `amplitude`, or `visibility` of a coherence scan — and the constant `background`) are refitted
 * by weighted linear least squares, then the candidates are ordered by the weighted residual sum
 * Σ (y − f)²/σ² (σ of the noise setup: given, √counts, or 1). The nonlinear parameters (centre,
 * separation, width, size…) come from the heuristics; the linear ones need no guessing, which also
 * makes a seed from another model usable whatever that model's `amplitude` means.
 */
import { expandParameters } from "../parameterPlan.js";
import { startVector, type PreparedFit } from "../preparedFit.js";

/** A candidate start (SI values by parameter name) with its ranking score. */
export interface RankedStart {
  start: Record<string, number>;
  /** Weighted residual sum at the start after the linear refit (dimensionless; Infinity when not finite). */
  score: number;
}

/** Name of the parameter that scales the whole model, or null. */
export function scaleParameter(names: readonly string[]): string | null {
  if (names.includes("amplitude")) return "amplitude";
  // Coherence scans: the model is V0·|μ(d)|, so V0 scales it.
  if (!names.includes("center") && names.includes("visibility") && (names.includes("diameter") || names.includes("rmsSize"))) return "visibility";
  return null;
}

/**
 * Refits the scale and background of `candidate` linearly and scores it.
 * @param stride use every stride-th point only (ranking many candidates of a costly model)
 */
export function rescaleCandidate(prep: PreparedFit, candidate: Record<string, number>, stride = 1): RankedStart {
  const { plan, model } = prep;
  const names = plan.names;
  const x = strided(prep.x, stride), y = strided(prep.y, stride), sigma = strided(prep.noise.sigma, stride);
  const n = x.length;
  const theta = startVector(prep, candidate);
  const full = new Float64Array(names.length);
  const freeIndex = (name: string | null): number => {
    if (name === null) return -1;
    const j = names.indexOf(name);
    const k = plan.free.indexOf(j);
    return k >= 0 && prep.options.start?.[name] === undefined ? k : -1;
  };
  const kScale = freeIndex(scaleParameter(names));
  const kOffset = freeIndex("background");
  const start: Record<string, number> = { ...candidate };
  const evaluate = (out: Float64Array): boolean => {
    expandParameters(plan, theta, full);
    model.evaluate(x, full, out);
    for (let i = 0; i < n; i++) if (!Number.isFinite(out[i])) return false;
    return true;
  };
  const f = new Float64Array(n);
  if (kScale >= 0) {
    // y − f0 = A·shape + b, shape = f(A = 1, b = 0) − f(A = 0, b = 0).
    const f1 = new Float64Array(n);
    theta[kScale] = 1;
    if (kOffset >= 0) theta[kOffset] = 0;
    if (!evaluate(f1)) return { start, score: Infinity };
    theta[kScale] = 0;
    if (!evaluate(f)) return { start, score: Infinity };
    let sw = 0, ss = 0, s1 = 0, sy = 0, s1y = 0;
    for (let i = 0; i < n; i++) {
      const w = 1 / (sigma[i] * sigma[i]), shape = f1[i] - f[i], r = y[i] - f[i];
      sw += w; ss += w * shape * shape; s1 += w * shape; sy += w * r; s1y += w * shape * r;
    }
    let scale: number, offset = 0;
    if (kOffset >= 0) {
      const det = sw * ss - s1 * s1;
      scale = det > 0 ? (sw * s1y - s1 * sy) / det : s1y / ss;
      offset = det > 0 ? (ss * sy - s1 * s1y) / det : 0;
    } else {
      scale = ss > 0 ? s1y / ss : 0;
    }
    const lo = plan.lower[kScale], hi = plan.upper[kScale];
    const clipped = Math.min(hi, Math.max(lo > 0 ? lo : 1e-12 * Math.abs(scale) + 1e-300, scale));
    if (clipped !== scale && kOffset >= 0) offset = (sy - clipped * s1) / sw; // refit the offset alone
    theta[kScale] = clipped;
    if (kOffset >= 0) {
      // Keep the start's intensity positive (the Poisson deviance needs f > 0).
      let lowest = Infinity;
      for (let i = 0; i < n; i++) lowest = Math.min(lowest, f[i] + clipped * (f1[i] - f[i]));
      const floor = 1e-3 * Math.abs(clipped) - lowest;
      theta[kOffset] = prep.noise.id === "poisson" ? Math.max(offset, floor) : offset;
      start.background = theta[kOffset];
    }
    start[names[plan.free[kScale]]] = clipped;
  }
  if (!evaluate(f)) return { start, score: Infinity };
  let score = 0;
  for (let i = 0; i < n; i++) score += ((y[i] - f[i]) / sigma[i]) ** 2;
  return { start, score: Number.isFinite(score) ? score : Infinity };
}

/**
 * Rescales and scores every candidate, drops near-duplicates (all free start values within 1e-6
 * relative) and returns the best `keep`, best first. The heuristic's own first choice is always
 * kept (last when it ranks lower): a score at the start is only a guess at where the solver ends.
 */
export function rankCandidates(prep: PreparedFit, candidates: Record<string, number>[], keep: number, stride = 1): RankedStart[] {
  const all = candidates.map((c) => rescaleCandidate(prep, c, stride));
  const first = all[0];
  const ranked = all.filter((r) => r.score < Infinity);
  ranked.sort((a, b) => a.score - b.score);
  const out: RankedStart[] = [];
  const vectors: Float64Array[] = [];
  for (const r of ranked) {
    const v = startVector(prep, r.start);
    if (vectors.some((u) => u.every((value, k) => Math.abs(value - v[k]) <= 1e-6 * Math.max(Math.abs(value), Math.abs(v[k]), 1e-300)))) continue;
    vectors.push(v);
    out.push(r);
    if (out.length >= keep) break;
  }
  if (first && first.score < Infinity && !out.includes(first) && out.length > 0) {
    const v = startVector(prep, first.start);
    const duplicate = vectors.some((u) => u.every((value, k) => Math.abs(value - v[k]) <= 1e-6 * Math.max(Math.abs(value), Math.abs(v[k]), 1e-300)));
    if (!duplicate) out[Math.min(out.length, keep - 1)] = first;
  }
  return out;
}

function strided(values: Float64Array, stride: number): Float64Array {
  if (stride <= 1) return values;
  const out = new Float64Array(Math.ceil(values.length / stride));
  for (let i = 0, k = 0; i < values.length; i += stride, k++) out[k] = values[i];
  return out;
}
