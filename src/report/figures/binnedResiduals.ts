/**
 * Binned residuals: what tells two models apart along a line. Single normalised residuals of
 * competing fits look like the same noise cloud; their sums over bins do not. Per bin of m
 * used points the statistic z = Σ rᵢ / √m is standard normal for a model that describes the
 * data (sum of independent N(0,1) — common practice), so a model that misses a systematic
 * feature shows runs of |z| well above 2 where it misses.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { Profile } from "../../profile.js";

/** Binned normalised residuals of one fit (positions in m). */
export interface BinnedResiduals {
  /** Mean position of the used points in each bin (m). */
  x: Float64Array;
  /** z = Σ r / √m per bin (dimensionless, N(0,1) for a good model). */
  z: Float64Array;
  /** Used points per bin. */
  counts: Int32Array;
}

/**
 * Bins the used points of a profile (mask = 1, finite residual) into `bins` runs of equal
 * point count and sums the normalised residuals in each.
 * @param profile   the fitted profile (x in m)
 * @param residuals normalised residuals (y − f)/σ at every x, NaN where masked
 * @param bins      number of bins (default: one per 25 used points, 8 to 60)
 */
export function binResiduals(profile: Profile, residuals: ArrayLike<number>, bins?: number): BinnedResiduals {
  if (residuals.length !== profile.x.length) throw new InvalidArgumentError("residuals", residuals.length, `${profile.x.length} values, one per profile point`);
  const used: number[] = [];
  for (let i = 0; i < profile.x.length; i++) if ((!profile.mask || profile.mask[i]) && Number.isFinite(residuals[i])) used.push(i);
  const count = bins ?? Math.min(60, Math.max(8, Math.floor(used.length / 25)));
  if (!Number.isInteger(count) || count < 1) throw new InvalidArgumentError("bins", bins, "a positive whole number of bins");
  const k = Math.min(count, used.length);
  const x = new Float64Array(k), z = new Float64Array(k), counts = new Int32Array(k);
  for (let b = 0; b < k; b++) {
    const from = Math.floor((b * used.length) / k), to = Math.floor(((b + 1) * used.length) / k);
    let sx = 0, sr = 0;
    for (let j = from; j < to; j++) { sx += profile.x[used[j]]; sr += residuals[used[j]]; }
    const m = to - from;
    x[b] = sx / m; z[b] = sr / Math.sqrt(m); counts[b] = m;
  }
  return { x, z, counts };
}
