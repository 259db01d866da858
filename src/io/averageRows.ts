/**
 * Rows of a region → one profile along the fringe normal: each row is sampled at
 * u = (x − xc) cos θ + (y − yc) sin θ by linear interpolation and the samples are averaged.
 */
import type { RegionOfInterest } from "./frameToLine.js";

/** Row average along the fringe normal, with the flags of samples that touched saturated pixels. */
export interface Averaged {
  pixel: Float64Array;
  y: Float64Array;
  sigma: Float64Array;
  mask: Uint8Array;
  saturatedFlag: Uint8Array;
  masked: number;
}

/**
 * Samples every row along the fringe normal u = (x − xc) cos θ + (y − yc) sin θ (linear
 * interpolation along the row) and averages over rows; σ from the mean square second
 * difference between rows (a generalisation of the successive-difference estimator of von
 * Neumann et al. 1941, Ann. Math. Stat. 12, 153), which ignores slow changes along the fringes.
 * @param values        row-major pixels of the region
 * @param flags         1 saturated, 2 unusable (bad flat), 0 fine
 * @param roi           the region (its x gives the pixel numbers of the output)
 * @param tilt          angle of the fringe normal from the rows (rad)
 * @param maskSaturated leave out and mask samples touching saturated pixels
 * @param yOffset       shift of the rotation centre in rows (used when averaging half a region)
 * @param varianceFloor smallest per-pixel variance (e.g. 1/12 code² of quantisation)
 */
export function averageRows(values: Float32Array, flags: Uint8Array, roi: RegionOfInterest, tilt: number, maskSaturated: boolean, yOffset = 0, varianceFloor = 0): Averaged {
  const { width: w, height: h } = roi;
  const xc = (w - 1) / 2;
  const yc = (h - 1) / 2 - yOffset;
  const cos = Math.cos(tilt);
  const sin = Math.sin(tilt);
  const sum = new Float64Array(w);
  const count = new Float64Array(w);
  const diff2 = new Float64Array(w);
  const diffCount = new Float64Array(w);
  const previous = new Float64Array(w).fill(NaN);
  const beforePrevious = new Float64Array(w).fill(NaN);
  const saturatedFlag = new Uint8Array(w);
  for (let r = 0; r < h; r++) {
    const shift = (r - yc) * sin;
    const row = r * w;
    // x(k) = xc + (k − xc − shift)/cos θ, a straight line in k.
    const x0 = xc - (xc + shift) / cos;
    const dx = 1 / cos;
    for (let k = 0; k < w; k++) {
      const x = x0 + k * dx;
      const c0 = Math.floor(x);
      if (c0 < 0 || c0 > w - 1 || (c0 === w - 1 && x > c0)) {
        previous[k] = NaN;
        beforePrevious[k] = NaN;
        continue;
      }
      const t = x - c0;
      const c1 = t > 0 ? c0 + 1 : c0;
      if (flags[row + c0] !== 0 || flags[row + c1] !== 0) {
        if (flags[row + c0] === 1 || flags[row + c1] === 1) saturatedFlag[k] = 1;
        if (maskSaturated || flags[row + c0] === 2 || flags[row + c1] === 2) {
          previous[k] = NaN;
          beforePrevious[k] = NaN;
          continue;
        }
      }
      const v = (values[row + c0] as number) * (1 - t) + (values[row + c1] as number) * t;
      sum[k] = (sum[k] as number) + v;
      count[k] = (count[k] as number) + 1;
      // Second difference along the column: a straight-line change of intensity along the
      // fringes cancels; for independent noise of variance σ², E[(v − 2p + q)²] = 6σ².
      const p = previous[k] as number;
      const q = beforePrevious[k] as number;
      if (!Number.isNaN(p) && !Number.isNaN(q)) {
        const d = v - 2 * p + q;
        diff2[k] = (diff2[k] as number) + d * d;
        diffCount[k] = (diffCount[k] as number) + 1;
      }
      beforePrevious[k] = p;
      previous[k] = v;
    }
  }
  const pixel = new Float64Array(w);
  const y = new Float64Array(w);
  const sigma = new Float64Array(w);
  const mask = new Uint8Array(w);
  let masked = 0;
  // Pooled noise for columns with too few row pairs to estimate their own.
  let pooled = 0, pooledCount = 0;
  for (let k = 0; k < w; k++) { pooled += diff2[k] as number; pooledCount += diffCount[k] as number; }
  const pooledVar = pooledCount > 0 ? pooled / (6 * pooledCount) : 0;
  for (let k = 0; k < w; k++) {
    pixel[k] = roi.x + k;
    const n = count[k] as number;
    if (n === 0) {
      y[k] = 0;
      sigma[k] = Math.sqrt(Math.max(pooledVar, varianceFloor, 1e-300)); // placeholder; the sample is masked
      if (saturatedFlag[k]) masked++;
      continue;
    }
    y[k] = (sum[k] as number) / n;
    const variance = (diffCount[k] as number) >= 4 ? (diff2[k] as number) / (6 * (diffCount[k] as number)) : pooledVar;
    sigma[k] = Math.sqrt(Math.max(variance, varianceFloor, 1e-300) / n);
    mask[k] = 1;
    if (saturatedFlag[k] && maskSaturated) { mask[k] = 0; masked++; }
  }
  return { pixel, y, sigma, mask, saturatedFlag, masked };
}
