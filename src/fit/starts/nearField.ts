/**
 * Candidate starts for the near-field (Fresnel) N-slit model, from three independent clues:
 *   1. geometric shadows: at Fresnel numbers a²/(λL) ≳ 1 each slit casts a bright band of about
 *      its own width centred on the slit (Born & Wolf §8.7); the bands above half the bright level
 *      give the slit centres (→ separation, spacing of neighbours) and widths;
 *   2. fringe period: where the slits' light overlaps, the two Fresnel phases differ by
 *      2π v d/(λL), so the fringes have period λL/d exactly as in the far field (small angle):
 *      the spectral peak gives a separation;
 *   3. the far-field automatic start (fringe period and sinc² envelope).
 * The centre is the point of mirror symmetry of the smoothed profile. Every (separation, width)
 * pair from these clues and a ladder of width/separation ratios is ranked by the model itself
 * after a linear refit of amplitude and background (rank.ts), so amplitude's near-field meaning
 * (the illuminating intensity) needs no guess.
 */
import { autoStartCandidates, fringeFrequency, movingAverage, resampleUniform, symmetryIndex } from "../autoStart.js";
import type { StartContext } from "./context.js";

/** Near-field candidates (see module comment). */
export function nearFieldCandidates(ctx: StartContext): Record<string, number>[] {
  const { prep, known, has } = ctx;
  const { x, y } = prep;
  const n = x.length;
  if (n < 16) return [];
  const wavelength = known("wavelength"), distance = known("distance");
  const slits = has("slits") ? Math.max(1, Math.round(known("slits"))) : 2;
  const dx = (x[n - 1] - x[0]) / (n - 1);
  if (!(dx > 0)) return [];
  const grid = resampleUniform(x, y, dx);
  const fresnelScale = Math.sqrt(wavelength * distance); // width of the edge ripples (m)
  const smooth = movingAverage(grid, Math.max(1, Math.round((0.25 * fresnelScale) / dx)));
  const sorted = Float64Array.from(smooth).sort();
  const floor = sorted[Math.floor(0.02 * (n - 1))];
  const top = sorted[Math.floor(0.98 * (n - 1))];
  const center = x[0] + symmetryIndex(smooth, floor) * dx;

  const separations: number[] = [];
  const widths: number[] = [];
  // 1. Bright bands above half the bright level.
  const bands = brightBands(smooth, floor + 0.5 * (top - floor));
  if (bands.length > 0) {
    const chosen = [...bands].sort((a, b) => b.mass - a.mass).slice(0, slits).sort((a, b) => a.middle - b.middle);
    const lengths = chosen.map((b) => b.length * dx).sort((a, b) => a - b);
    widths.push(lengths[Math.floor(lengths.length / 2)]);
    if (chosen.length >= 2 && slits >= 2) {
      separations.push(((chosen[chosen.length - 1].middle - chosen[0].middle) * dx) / (chosen.length - 1));
    } else if (chosen.length === 1 && slits >= 2) {
      // One merged band holding all slits: its length ≈ (N − 1)d + a.
      widths.push((chosen[0].length * dx) / (2 * slits - 1));
      separations.push((chosen[0].length * dx) / slits);
    }
  }
  // 2. Fringe period in the overlap.
  const spectral = fringeFrequency(grid, dx);
  if (spectral && slits >= 2) separations.push(spectral.frequency * wavelength * distance);
  // 3. Far-field start.
  for (const c of autoStartCandidates(x, y, wavelength, distance, false, 1, slits >= 2)) {
    if (slits >= 2 && c.separation > 0) separations.push(c.separation);
    if (c.width > 0) widths.push(c.width);
  }
  const span = x[n - 1] - x[0];
  const usable = (v: number): boolean => Number.isFinite(v) && v > 2 * dx && v < span;
  const out: Record<string, number>[] = [];
  const seps = slits >= 2 ? separations.filter(usable) : [0];
  for (const d of seps) {
    const tries = new Set<number>();
    for (const a of widths.filter(usable)) for (const f of [0.8, 1, 1.25]) tries.add(a * f);
    if (slits >= 2) for (const r of [0.1, 0.2, 0.3, 0.45, 0.6, 0.8]) tries.add(d * r);
    for (const a of tries) {
      if (slits >= 2 && a >= 0.98 * d) continue;
      out.push(slits >= 2 ? { center, separation: d, width: a } : { center, width: a });
    }
  }
  if (slits < 2) for (const a of [0.05, 0.1, 0.2].map((f) => f * span)) out.push({ center, width: a });
  return out;
}

interface Band { middle: number; length: number; mass: number }

/** Runs of samples above `level` (centre index, length in samples, summed excess). */
function brightBands(values: Float64Array, level: number): Band[] {
  const bands: Band[] = [];
  let start = -1, mass = 0;
  for (let i = 0; i <= values.length; i++) {
    const above = i < values.length && values[i] > level;
    if (above) {
      if (start < 0) { start = i; mass = 0; }
      mass += values[i] - level;
    } else if (start >= 0) {
      const length = i - start;
      if (length >= 3) bands.push({ middle: (start + i - 1) / 2, length, mass });
      start = -1;
    }
  }
  return bands;
}
