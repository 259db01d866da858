/** Tilt refinement by cross-correlating the de-tilted upper and lower halves of a region. */
import { averageRows } from "./averageRows.js";
import type { RegionOfInterest } from "./frameToLine.js";

/**
 * Refines a tilt estimate: the upper and lower halves of the rows, each de-tilted with the
 * estimate, are cross-correlated; their residual shift δ over the distance Δy between the
 * halves' centres gives the correction atan(δ / Δy). Two passes.
 * @param values row-major pixels of the region
 * @param flags  pixels to leave out (non-zero)
 * @param roi    the region
 * @param start  first estimate of the tilt (rad), e.g. from measureTilt
 */
export function refineTilt(values: Float32Array, flags: Uint8Array, roi: RegionOfInterest, start: number): number {
  if (roi.height < 8 || roi.width < 16) return start;
  const half = Math.floor(roi.height / 2);
  const top = { ...roi, height: half };
  const bottom = { ...roi, height: half };
  const upper = values.subarray(0, half * roi.width), lower = values.subarray((roi.height - half) * roi.width);
  const upperFlags = flags.subarray(0, half * roi.width), lowerFlags = flags.subarray((roi.height - half) * roi.width);
  const dy = roi.height - half;
  let tilt = start;
  for (let pass = 0; pass < 2; pass++) {
    // Each half is sampled about its own centre; shift the lower one by the tilt across Δy.
    const a = averageRows(upper, upperFlags, top, tilt, true, -dy / 2);
    const b = averageRows(lower, lowerFlags, bottom, tilt, true, dy / 2);
    const delta = subPixelShift(a.y, a.mask, b.y, b.mask, 4);
    if (delta === undefined) return tilt;
    tilt -= Math.atan(delta / dy);
  }
  return tilt;
}

/** Shift s (pixels, within ±range) maximising Σ a(k) b(k + s) of the mean-removed profiles, to a parabola's vertex. */
function subPixelShift(a: Float64Array, am: Uint8Array, b: Float64Array, bm: Uint8Array, range: number): number | undefined {
  const n = a.length;
  const mean = (y: Float64Array, m: Uint8Array): number => { let s = 0, c = 0; for (let i = 0; i < n; i++) if (m[i]) { s += y[i]!; c++; } return c > 0 ? s / c : 0; };
  const ma = mean(a, am), mb = mean(b, bm);
  const score: number[] = [];
  for (let s = -range; s <= range; s++) {
    let sum = 0, count = 0;
    for (let k = Math.max(0, -s); k < Math.min(n, n - s); k++) {
      if (!am[k] || !bm[k + s]) continue;
      sum += (a[k]! - ma) * (b[k + s]! - mb);
      count++;
    }
    score.push(count > 0 ? sum / count : -Infinity);
  }
  let best = 1;
  for (let i = 1; i < score.length - 1; i++) if (score[i]! > score[best]!) best = i;
  const [l, c, r] = [score[best - 1]!, score[best]!, score[best + 1]!];
  const denominator = l - 2 * c + r;
  if (!Number.isFinite(denominator) || denominator >= 0) return undefined;
  return best - range + (0.5 * (l - r)) / denominator;
}
