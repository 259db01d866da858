/**
 * Is there a fringe in the profile at all, and is the fitted one sampled well enough?
 *
 * Test: the classical periodogram P(f_k) = |Σ (y_i − ȳ) e^{−2πi f_k x_i}|² / n of the used
 * points at f_k = k/(N·Δx), k = 3 … N/2 (at least three periods across the profile, up to the
 * Nyquist frequency of the median spacing Δx). Against white noise each ordinate is exponential
 * with mean μ (Schuster 1898; Scargle 1982, ApJ 263:835, §III); μ is estimated as the mean of
 * the m ordinates within ±32 bins (the 5 nearest left out, lines above 10× their median dropped),
 * so a smooth envelope's leakage near zero frequency is part of the floor, not of the peak.
 * z = P/μ̂ then follows F(2, 2m): P(z > t) = (1 + t/m)^(−m); over M searched frequencies the
 * false-alarm probability is 1 − (1 − (1 + z/m)^(−m))^M; a fringe is significant below 0.001. After a fit the power tested is the one at the fitted frequency
 * (±1 bin), with the same M since the fit chose its frequency; the strongest local maximum of the
 * periodogram is reported beside it. Needs about five periods across the profile.
 * Aliasing: a fitted fringe period λL/d below two sample spacings lies above the Nyquist
 * frequency (Shannon 1949): the data cannot show it.
 */

/** False-alarm probability below which a spectral peak counts as a fringe. */
export const FRINGE_FALSE_ALARM = 1e-3;

/** The fringe-detection outcome stored in `result.goodness.fringes`. */
export interface FringeDetection {
  test: "periodogram-peak";
  /**
   * Whether the fringe is significant (false alarm < FRINGE_FALSE_ALARM): at the fitted frequency
   * when there is one inside the searched band, else the strongest peak.
   */
  significant: boolean;
  /** Whether every frequency was searched (false: the fitted fringe was significant on its own). */
  fullSearch: boolean;
  /** Period of the strongest peak (m) and in sample spacings (the fitted one when fullSearch is false). */
  peakPeriod: number;
  peakPeriodSamples: number;
  /** Peak power over the local noise floor (dimensionless) and its false-alarm probability. */
  powerRatio: number;
  falseAlarm: number;
  /** Frequencies searched (the M of the false-alarm probability). */
  searched: number;
  /** Median sample spacing Δx (m). */
  spacing: number;
  /** Fitted fringe period λL/d (m) and in sample spacings, when the model has one. */
  fittedPeriod?: number;
  fittedPeriodSamples?: number;
  /** Power at the fitted frequency (±1 bin) over the local floor (dimensionless) and its false-alarm probability. */
  fittedPowerRatio?: number;
  fittedFalseAlarm?: number;
  /** Fitted periods across the data, set when fewer than two made the fringe not significant (dimensionless). */
  fittedCycles?: number;
}

const SMALLEST_K = 3;
const FLOOR_HALF_WIDTH = 32;
const FLOOR_GAP = 2;

/**
 * Periodogram test for a fringe in (x, y).
 * @param x positions (m), increasing
 * @param y intensities (any unit)
 * @param fittedPeriod fitted fringe period (m), optional, for the aliasing check and its power
 * @returns undefined when the profile is too short for the test (fewer than 16 points)
 */
export function detectFringes(x: Float64Array, y: Float64Array, fittedPeriod?: number): FringeDetection | undefined {
  const n = x.length;
  if (n < 16) return undefined;
  const steps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) steps[i - 1] = x[i] - x[i - 1];
  const spacing = median(steps);
  if (!(spacing > 0)) return undefined;
  const span = Math.round((x[n - 1] - x[0]) / spacing) + 1;
  const kMax = Math.floor(span / 2);
  if (kMax <= SMALLEST_K + 24) return undefined;
  const df = 1 / (span * spacing);
  // Ordinates are computed where needed: around the fitted frequency first (cheap, O(65 n)); the
  // full search over all frequencies only when there is no fitted one or it is not significant.
  const power = new Float64Array(kMax + 1).fill(NaN);
  const mean = meanOf(y);
  const fill = (from: number, to: number): void => periodogramRange(x, y, mean, df, Math.max(1, from), Math.min(kMax, to), power);
  // Local floor: mean of the neighbours (gap left out; lines above 10× their median dropped).
  const floorAt = (k: number): { mean: number; count: number } => {
    const values: number[] = [];
    for (let j = Math.max(1, k - FLOOR_HALF_WIDTH); j <= Math.min(kMax, k + FLOOR_HALF_WIDTH); j++) {
      if (Math.abs(j - k) > FLOOR_GAP) values.push(power[j]);
    }
    const cut = 10 * median(Float64Array.from(values));
    let sum = 0, count = 0;
    for (const v of values) if (v <= cut) { sum += v; count++; }
    return { mean: sum / count, count };
  };
  // P/floor for white noise: F(2, 2m) with m floor bins, P(> z) = (1 + z/m)^(−m).
  const tail = (z: number, m: number): number => Math.exp(-m * Math.log1p(z / m));
  const searched = kMax - SMALLEST_K + 1;
  const falseAlarmOf = (z: number, m: number): number => (Number.isFinite(z) && z > 0 ? -Math.expm1(searched * Math.log1p(-tail(z, m))) : 1);
  const fitted: Partial<FringeDetection> = {};
  let fittedK = -1;
  if (fittedPeriod !== undefined && fittedPeriod > 0 && Number.isFinite(fittedPeriod)) {
    fitted.fittedPeriod = fittedPeriod;
    fitted.fittedPeriodSamples = fittedPeriod / spacing;
    const k = Math.round(1 / (fittedPeriod * df));
    if (k >= 1 && k <= kMax) {
      fittedK = k;
      fill(k - FLOOR_HALF_WIDTH - 1, k + FLOOR_HALF_WIDTH + 1);
      let peak = 0;
      for (let j = Math.max(1, k - 1); j <= Math.min(kMax, k + 1); j++) peak = Math.max(peak, power[j]);
      const floor = floorAt(k);
      fitted.fittedPowerRatio = peak / floor.mean;
      // The fit chose its frequency among all of them (and the best of 3 bins here): M × 3 trials.
      fitted.fittedFalseAlarm = Math.min(1, 3 * falseAlarmOf(fitted.fittedPowerRatio, floor.count));
      if (fitted.fittedFalseAlarm < FRINGE_FALSE_ALARM) {
        return {
          test: "periodogram-peak", significant: true, fullSearch: false,
          peakPeriod: 1 / (k * df), peakPeriodSamples: span / k, powerRatio: fitted.fittedPowerRatio, falseAlarm: fitted.fittedFalseAlarm,
          searched, spacing, ...fitted,
        };
      }
    }
  }
  fill(1, kMax);
  // Strongest local maximum (a spectral line, not the slope of an envelope's low-frequency power).
  let best = SMALLEST_K, bestRatio = -Infinity, bestCount = 1;
  for (let k = SMALLEST_K; k <= kMax; k++) {
    if (power[k] < power[k - 1] || (k < kMax && power[k] < power[k + 1])) continue;
    const floor = floorAt(k);
    const ratio = power[k] / floor.mean;
    if (ratio > bestRatio) { bestRatio = ratio; best = k; bestCount = floor.count; }
  }
  const falseAlarm = falseAlarmOf(bestRatio, bestCount);
  const detection: FringeDetection = {
    test: "periodogram-peak",
    // With a fitted frequency in the band, the verdict is about it; else about the strongest peak.
    significant: fittedK > 0 ? false : falseAlarm < FRINGE_FALSE_ALARM,
    fullSearch: true,
    peakPeriod: 1 / (best * df),
    peakPeriodSamples: span / best,
    powerRatio: bestRatio,
    falseAlarm,
    searched,
    spacing,
    ...fitted,
  };
  return detection;
}

/** Mean of the values. */
function meanOf(y: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < y.length; i++) sum += y[i];
  return sum / y.length;
}

/** P(f_k) = |Σ (y_i − ȳ) e^{−2πi k df (x_i − x_0)}|²/n for k = from … to, by phasor recurrence. */
function periodogramRange(x: Float64Array, y: Float64Array, mean: number, df: number, from: number, to: number, power: Float64Array): void {
  const n = x.length, count = to - from + 1;
  if (count <= 0) return;
  const re = new Float64Array(count), im = new Float64Array(count);
  for (let i = 0; i < n; i++) {
    const v = y[i] - mean;
    const step = -2 * Math.PI * df * (x[i] - x[0]);
    const stepRe = Math.cos(step), stepIm = Math.sin(step);
    let pr = v * Math.cos(step * from), pi = v * Math.sin(step * from);
    for (let t = 0; t < count; t++) {
      re[t] += pr; im[t] += pi;
      const nr = pr * stepRe - pi * stepIm;
      pi = pr * stepIm + pi * stepRe;
      pr = nr;
    }
  }
  for (let t = 0; t < count; t++) power[from + t] = (re[t] * re[t] + im[t] * im[t]) / n;
}

function median(values: Float64Array): number {
  if (values.length === 0) return NaN;
  const sorted = Float64Array.from(values).sort();
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}
