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
  const widthFree = prep.plan.names.includes("width") && prep.plan.free.includes(prep.plan.names.indexOf("width"))
    && prep.options.start?.width === undefined && candidate.width > 0;
  if (!widthFree || !hasInteriorGaps(prep)) return rescaleOnce(prep, candidate, stride);
  // The slit width comes from the envelope's fall-off, which masked (e.g. saturated) peaks
  // flatten: on such a gapped line the envelope looked twice as wide as it is. A short ladder of
  // widths, the best kept, lets the candidate's fringe period be judged with a fitting envelope.
  let best: RankedStart | null = null;
  for (const factor of WIDTH_LADDER) {
    const r = rescaleOnce(prep, { ...candidate, width: candidate.width * factor }, stride);
    if (best === null || r.score < best.score) best = r;
  }
  return best!;
}

/** True when masked points lie inside the used range (the heuristics then see interpolated gaps). */
export function hasInteriorGaps(prep: PreparedFit): boolean {
  const used = prep.used;
  return used.length > 0 && used[used.length - 1] - used[0] + 1 > used.length;
}

/** Multipliers of a candidate's slit width tried by {@link rescaleCandidate}. */
const WIDTH_LADDER = [1, 1.5, 2.2, 3.2, 0.7];

function rescaleOnce(prep: PreparedFit, candidate: Record<string, number>, stride: number): RankedStart {
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
  const kVisibility = freeIndex("visibility"), kPhase = freeIndex("phase");
  // Only on gapped lines: elsewhere the heuristics' own linear fit on the resampled line already
  // gives V and φ, and the refit would cost four model evaluations per candidate.
  if (kScale >= 0 && kVisibility >= 0 && kPhase >= 0 && names[plan.free[kScale]] === "amplitude" && hasInteriorGaps(prep)) {
    refitFringeTerms(theta, { kScale, kOffset, kVisibility, kPhase }, plan.lower, plan.upper, evaluate, y, sigma, n);
    start.visibility = theta[kVisibility];
    start.phase = theta[kPhase];
  }
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

/**
 * Fringe models are affine in V·cos φ and V·sin φ at fixed geometry: I = b + A·e + A·V·(cos φ·c − sin φ·s)
 * with e, c, s fixed shapes (detector effects are linear too). Solving that weighted linear least
 * squares problem gives the start's visibility and phase, so that a candidate is ranked by how well
 * its geometry can describe the data, not by how good the heuristic's contrast guess was (a line
 * with masked, saturated peaks fooled the guess). Leaves θ unchanged when the fit is degenerate.
 */
function refitFringeTerms(
  theta: Float64Array,
  k: { kScale: number; kOffset: number; kVisibility: number; kPhase: number },
  lower: ArrayLike<number>, upper: ArrayLike<number>,
  evaluate: (out: Float64Array) => boolean,
  y: Float64Array, sigma: Float64Array, n: number,
): void {
  const saved = Float64Array.from(theta);
  const at = (scale: number, visibility: number, phase: number, out: Float64Array): boolean => {
    theta[k.kScale] = scale; theta[k.kVisibility] = visibility; theta[k.kPhase] = phase;
    if (k.kOffset >= 0) theta[k.kOffset] = 0;
    return evaluate(out);
  };
  const base = new Float64Array(n), e = new Float64Array(n), c = new Float64Array(n), s = new Float64Array(n);
  const ok = at(0, 0, 0, base) && at(1, 0, 0, e) && at(1, 1, 0, c) && at(1, 1, Math.PI / 2, s);
  theta.set(saved);
  if (!ok) return;
  // Columns: [1 (background, when free)], e, c, s — shapes relative to the A = 0 baseline.
  const columns: Float64Array[] = [];
  if (k.kOffset >= 0) columns.push(new Float64Array(n).fill(1));
  for (let i = 0; i < n; i++) { c[i] -= e[i]; s[i] -= e[i]; e[i] -= base[i]; }
  columns.push(e, c, s);
  const m = columns.length;
  const normal = new Float64Array(m * m), rhs = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    const w = 1 / (sigma[i] * sigma[i]), r = y[i] - base[i];
    for (let a = 0; a < m; a++) {
      const wa = w * columns[a][i];
      rhs[a] += wa * r;
      for (let b = a; b < m; b++) normal[a * m + b] += wa * columns[b][i];
    }
  }
  for (let a = 0; a < m; a++) for (let b = 0; b < a; b++) normal[a * m + b] = normal[b * m + a];
  const solution = solveSymmetric(normal, rhs, m);
  if (!solution) return;
  const [amplitude, cosTerm, sinTerm] = solution.slice(m - 3);
  if (!(amplitude > 0)) return;
  const visibility = Math.min(upper[k.kVisibility], Math.max(lower[k.kVisibility], Math.hypot(cosTerm, sinTerm) / amplitude));
  let phase = Math.atan2(sinTerm, cosTerm);
  const lo = lower[k.kPhase], hi = upper[k.kPhase];
  if (Number.isFinite(lo) && phase < lo) phase += 2 * Math.PI * Math.ceil((lo - phase) / (2 * Math.PI));
  if (Number.isFinite(hi) && phase > hi) phase -= 2 * Math.PI * Math.ceil((phase - hi) / (2 * Math.PI));
  if (!(phase >= lo && phase <= hi) || !Number.isFinite(visibility)) return;
  theta[k.kVisibility] = visibility;
  theta[k.kPhase] = phase;
}

/** Solves the small symmetric system A·x = b by Gaussian elimination with partial pivoting; null when singular. */
function solveSymmetric(matrix: Float64Array, rhs: Float64Array, m: number): number[] | null {
  const a = Float64Array.from(matrix), b = Float64Array.from(rhs);
  let largest = 0;
  for (let i = 0; i < m; i++) largest = Math.max(largest, Math.abs(a[i * m + i]));
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(a[r * m + col]) > Math.abs(a[pivot * m + col])) pivot = r;
    if (!(Math.abs(a[pivot * m + col]) > 1e-13 * largest)) return null;
    if (pivot !== col) {
      for (let j = 0; j < m; j++) { const t = a[col * m + j]; a[col * m + j] = a[pivot * m + j]; a[pivot * m + j] = t; }
      const t = b[col]; b[col] = b[pivot]; b[pivot] = t;
    }
    for (let r = col + 1; r < m; r++) {
      const factor = a[r * m + col] / a[col * m + col];
      for (let j = col; j < m; j++) a[r * m + j] -= factor * a[col * m + j];
      b[r] -= factor * b[col];
    }
  }
  const x = new Array<number>(m).fill(0);
  for (let r = m - 1; r >= 0; r--) {
    let sum = b[r];
    for (let j = r + 1; j < m; j++) sum -= a[r * m + j] * x[j];
    x[r] = sum / a[r * m + r];
  }
  return x.every(Number.isFinite) ? x : null;
}

function strided(values: Float64Array, stride: number): Float64Array {
  if (stride <= 1) return values;
  const out = new Float64Array(Math.ceil(values.length / stride));
  for (let i = 0, k = 0; i < values.length; i += stride, k++) out[k] = values[i];
  return out;
}
