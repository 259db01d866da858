/**
 * One summary of whether a fit's residuals look like noise, combining the runs test, the
 * Durbin–Watson statistic, lag-1 autocorrelation and leftover power at the fringe frequency.
 * The three p-values share one significance level by the Bonferroni rule (common practice).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import { fringeFrequencyOf } from "./fitParameters.js";
import { autocorrelation, durbinWatson, lombScarglePower, runsTest, type RunsTestResult } from "./residualTests.js";

/** Leftover periodicity of the residuals at the fringe frequency (cycles per metre). */
export interface PeriodicityResult {
  /** Fringe frequency tested (cycles per metre) and its first harmonic. */
  frequency: number;
  /** Normalised Lomb–Scargle power at the fringe frequency and at twice it. */
  power: number;
  harmonicPower: number;
  /** Mean power over frequencies away from both (the noise floor, ≈ 1 for white noise). */
  noiseFloor: number;
  /** max(power, harmonicPower) / noiseFloor. */
  ratio: number;
  /** Bonferroni-corrected p-value over the two frequencies: min(1, 2 exp(−max power)). */
  pValue: number;
}

/** Summary of the residual tests of one fit. */
export interface ResidualDiagnostics {
  /** Finite residuals used. */
  n: number;
  /** Mean and rms of the normalised residuals (rms ≈ 1 when σ is right). */
  mean: number;
  rms: number;
  runs: RunsTestResult;
  durbinWatson: number;
  lag1: { lag: number; value: number; pValue: number };
  /** Absent when positions or a fringe frequency are unknown. */
  periodicity?: PeriodicityResult;
  /** True when any test rejects white noise at the (Bonferroni-shared) level alpha. */
  structured: boolean;
  /** Plain reasons behind `structured`, one per failing test. */
  reasons: string[];
}

/** Options of residualDiagnostics. */
export interface ResidualDiagnosticsOptions {
  /** Detector positions (m) of every residual; needed for the periodicity test. */
  x?: ArrayLike<number>;
  /** Fringe frequency (cycles per metre); default separation/(wavelength · distance) from the fit. */
  fringeFrequency?: number;
  /** Overall significance level (default 0.01). */
  alpha?: number;
}

/**
 * Residual diagnostics of a fit (its normalised residuals (y − f)/σ, NaN where masked).
 * @example residualDiagnostics(fit, { x: profile.x }).structured // false for a good fit
 */
export function residualDiagnostics(fit: FitResult, options: ResidualDiagnosticsOptions = {}): ResidualDiagnostics {
  const alpha = options.alpha ?? 0.01;
  if (!(alpha > 0 && alpha < 1)) throw new InvalidArgumentError("alpha", alpha, "a significance level between 0 and 1");
  const r = fit.residuals;
  let n = 0, sum = 0, sumSq = 0;
  for (let i = 0; i < r.length; i++) {
    if (Number.isNaN(r[i])) continue;
    n++;
    sum += r[i];
    sumSq += r[i] * r[i];
  }
  const runs = runsTest(r);
  const lag1 = autocorrelation(r, 1);
  const frequency = options.fringeFrequency ?? fringeFrequencyOf(fit);
  const periodicity = options.x && frequency ? periodicityAt(options.x, r, frequency) : undefined;
  const tests = periodicity ? 3 : 2;
  const level = alpha / tests;
  const reasons: string[] = [];
  if (runs.pTooFew < level) {
    reasons.push(`too few sign runs (${runs.runs} against ${runs.expected.toFixed(0)} expected, ${pText(runs.pTooFew)})`);
  }
  if (lag1.pValue < level) {
    reasons.push(`neighbouring residuals correlated (lag-1 autocorrelation ${lag1.value.toFixed(2)}, ${pText(lag1.pValue)})`);
  }
  if (periodicity && periodicity.pValue < level) {
    reasons.push(`leftover power at the fringe frequency (${periodicity.ratio.toFixed(1)} × the noise floor, ${pText(periodicity.pValue)})`);
  }
  return {
    n,
    mean: n ? sum / n : NaN,
    rms: n ? Math.sqrt(sumSq / n) : NaN,
    runs,
    durbinWatson: durbinWatson(r),
    lag1,
    periodicity,
    structured: reasons.length > 0,
    reasons,
  };
}

/**
 * Leftover periodicity: Lomb–Scargle power at the fringe frequency and twice it, against the
 * mean power over 64 frequencies spread below the Nyquist limit, skipping ±3 resolution widths
 * (1/span) around both.
 * @param x         positions (m)
 * @param residuals normalised residuals (dimensionless)
 * @param frequency fringe frequency (cycles per metre)
 */
export function periodicityAt(x: ArrayLike<number>, residuals: ArrayLike<number>, frequency: number): PeriodicityResult {
  const power = lombScarglePower(x, residuals, frequency);
  const harmonicPower = lombScarglePower(x, residuals, 2 * frequency);
  const span = Math.abs(x[x.length - 1] - x[0]);
  const nyquist = (0.5 * (x.length - 1)) / span;
  const guard = 3 / span;
  let total = 0;
  let count = 0;
  for (let j = 1; j <= 96 && count < 64; j++) {
    const f = (nyquist * j) / 97;
    if (Math.abs(f - frequency) < guard || Math.abs(f - 2 * frequency) < guard || f < guard) continue;
    total += lombScarglePower(x, residuals, f);
    count++;
  }
  const noiseFloor = count ? total / count : NaN;
  const peak = Math.max(power, harmonicPower);
  return {
    frequency,
    power,
    harmonicPower,
    noiseFloor,
    ratio: peak / noiseFloor,
    pValue: Math.min(1, 2 * Math.exp(-peak)),
  };
}

/** A p-value (dimensionless) as a phrase: "p = 0.034", "p = 2.7e-9" or "p < 1e-12". */
export function pText(p: number): string {
  const text = formatP(p);
  return text.startsWith("<") ? `p ${text}` : `p = ${text}`;
}

/** p-value (dimensionless) in words-friendly form: two significant figures, or "< 1e-12". */
export function formatP(p: number): string {
  if (Number.isNaN(p)) return "n/a";
  if (p < 1e-12) return "< 1e-12";
  return p < 0.001 ? p.toExponential(1) : p.toPrecision(2);
}
