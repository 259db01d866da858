/**
 * Checks around a fit that make a doubtful result loud: geometry the user did not give
 * ("default-geometry"), warnings carried by the data (e.g. "saturated-masked"), and whether
 * the profile shows a fringe at all and the fitted one is resolved ("no-fringes",
 * "fringe-aliased"). The χ² test itself is in goodness.ts (every FitResult has it).
 */
import type { Model } from "../physics/model.js";
import { formatQuantity } from "../report/formatQuantity.js";
import { detectFringes, type FringeDetection } from "./fringeDetection.js";
import { hasInteriorGaps } from "./starts/rank.js";
import type { PreparedFit } from "./preparedFit.js";
import type { FitOptions, FitResult, FitWarning } from "./types.js";

/**
 * Parameters the geometry needs (fixed by default at a non-zero model default: wavelength,
 * distance, slits, sourceDistance) that the options neither fix, start, free nor tie: the fit
 * used the model default, so the fitted values depend on a number nobody gave.
 * @param model   the model fitted
 * @param options the caller's fit options
 */
export function defaultGeometryWarnings(model: Model, options: FitOptions): FitWarning[] {
  const named = new Set<string>([
    ...Object.keys(options.start ?? {}),
    ...(Array.isArray(options.fix) ? options.fix : Object.keys(options.fix ?? {})),
    ...(options.free ?? []),
    ...Object.keys(options.tie ?? {}),
  ]);
  return model.parameters
    .filter((p) => p.fixedByDefault && p.default !== 0 && !named.has(p.name))
    .map((p) => {
      const text = p.unit === "1" ? String(p.default) : formatQuantity(p.default, 0, p.unit).text;
      const example = p.unit === "1" ? `${p.default}` : `"${text}"`;
      return {
        code: "default-geometry",
        parameter: p.name,
        message: `${p.name} not given: the model default ${text} was used and the fitted values depend on it; give the real value (fix: { ${p.name}: ${example} }, or --fix ${p.name}=VALUE on the command line)`,
      };
    });
}

/** Models whose fringe period is λL/d on the detector (they have separation, wavelength and distance). */
function fringePeriod(result: FitResult): number | undefined {
  const value = (name: string): number | undefined => result.parameters.find((p) => p.name === name)?.value;
  // The near-field pattern has no single fringe period λL/d (shadows of the slits with Fresnel
  // ripples, interference only where the diffracted beams overlap): the test does not apply;
  // the goodness-of-fit test still judges the fit.
  if (result.modelId === "two-slit-fresnel") return undefined;
  const d = value("separation"), lambda = value("wavelength"), L = value("distance");
  if (d === undefined || lambda === undefined || L === undefined) return undefined;
  return d > 0 ? (lambda * L) / d : Infinity;
}

/**
 * Adds the data's coded warnings, the default-geometry warnings, and for fringe models the
 * fringe detection (result.goodness.fringes) with "no-fringes" / "fringe-aliased" warnings.
 * Mutates and returns `result`.
 * @param prep    the prepared fit (used points)
 * @param result  the fit result
 * @param options the caller's options (to know what was given)
 */
export function addFitChecks(prep: PreparedFit, result: FitResult, options: FitOptions): FitResult {
  const warnings: FitWarning[] = [];
  for (const w of prep.profile.warnings ?? []) warnings.push({ code: w.code, message: w.message });
  warnings.push(...defaultGeometryWarnings(prep.model, options));
  const period = fringePeriod(result);
  if (period !== undefined) {
    const detection = detectFringes(prep.x, fringeSeries(prep, result, period), Number.isFinite(period) ? period : undefined);
    if (detection) {
      result.goodness.fringes = detection;
      // A "fringe" spanning the data fewer than twice is indistinguishable from the envelope's
      // shape (a smooth beam fits as one slow cosine), however strong its spectral power.
      const cycles = Number.isFinite(period) && period > 0 ? (prep.x[prep.x.length - 1] - prep.x[0]) / period : Infinity;
      if (detection.significant && cycles < MIN_FRINGE_CYCLES) {
        detection.significant = false;
        detection.fittedCycles = cycles;
        warnings.push({ code: "no-fringes", message: tooFewCyclesMessage(detection, cycles) });
      } else if (!detection.significant) {
        warnings.push({
          code: "no-fringes",
          message: noFringeMessage(detection),
        });
      }
      if (detection.fittedPeriodSamples !== undefined && detection.fittedPeriodSamples < 2) {
        warnings.push({
          code: "fringe-aliased",
          parameter: "separation",
          message: `the fitted fringe period λL/d = ${formatQuantity(period, 0, "m").text} is ${detection.fittedPeriodSamples.toPrecision(3)} sample spacings, below the 2 the sampling can show (Nyquist): the fit follows an alias; check the pixel pitch, wavelength and distance, or start the separation lower`,
        });
      }
    }
  }
  // Data and geometry first: they explain what follows.
  result.warnings = [...warnings, ...result.warnings];
  return result;
}

/**
 * The series the fringe test looks at: the data themselves, except on a line with masked points
 * inside it (e.g. saturated peaks), where the holes recur at the fringe period and spread the
 * envelope's power over the neighbouring frequencies, burying the fringe under a raised floor.
 * There the test sees (y − f₀)/σ, with f₀ the fitted curve averaged over one fringe period P
 * (16 points across it; the mean of a cos fringe, or of an N-slit grating factor, over a period
 * is its constant term, so f₀ is the fringe-free envelope for every far-field model): the
 * envelope is removed and the noise is white with unit variance, as the periodogram test assumes
 * (the standardised form of Scargle 1982's unevenly sampled periodogram).
 */
function fringeSeries(prep: PreparedFit, result: FitResult, period: number): Float64Array {
  if (!hasInteriorGaps(prep) || !(period > 0) || !Number.isFinite(period)) return prep.y;
  const names = prep.plan.names;
  const params = Float64Array.from(names, (name) => result.parameters.find((p) => p.name === name)?.value ?? NaN);
  if (!params.every(Number.isFinite)) return prep.y;
  const n = prep.x.length, steps = 16;
  const f0 = new Float64Array(n), shifted = new Float64Array(n), values = new Float64Array(n);
  for (let j = 0; j < steps; j++) {
    const offset = ((j + 0.5) / steps - 0.5) * period;
    for (let i = 0; i < n; i++) shifted[i] = prep.x[i] + offset;
    prep.model.evaluate(shifted, params, values);
    for (let i = 0; i < n; i++) f0[i] += values[i] / steps;
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = (prep.y[i] - f0[i]) / prep.noise.sigma[i];
  return out.every(Number.isFinite) ? out : prep.y;
}

/** Fewest fringe periods across the data that a fringe can be told from the envelope by. */
const MIN_FRINGE_CYCLES = 2;

/** "no significant fringe …" for a fitted period longer than half the data. */
function tooFewCyclesMessage(d: FringeDetection, cycles: number): string {
  const probability = (d.fittedFalseAlarm ?? d.falseAlarm).toPrecision(2);
  return `no significant fringe in these data at the fitted period: the fitted period (${(d.fittedPeriodSamples ?? d.peakPeriodSamples).toPrecision(3)} samples) covers the data only ${cycles.toFixed(1)} times, too few to tell a fringe from the envelope (at least ${MIN_FRINGE_CYCLES} are needed), whatever its spectral false-alarm probability ${probability} (a fringe needs < 0.001); separation, visibility and phase are not meaningful`;
}

/** "no significant fringe …" with the numbers of the test. */
function noFringeMessage(d: FringeDetection): string {
  const atFit = d.fittedPowerRatio !== undefined
    ? `the power at the fitted period (${d.fittedPeriodSamples!.toPrecision(3)} samples) is ${d.fittedPowerRatio.toPrecision(3)}× the local noise floor, false-alarm probability ${d.fittedFalseAlarm!.toPrecision(2)} (a fringe needs < 0.001)`
    : `the strongest periodic component is ${d.powerRatio.toPrecision(3)}× the local noise floor, false-alarm probability ${d.falseAlarm.toPrecision(2)} (a fringe needs < 0.001)`;
  const elsewhere = d.fittedPowerRatio !== undefined && d.falseAlarm < 1e-3
    ? `; the data do carry a periodic component of period ${d.peakPeriodSamples.toPrecision(3)} samples (${formatQuantity(d.peakPeriod, 0, "m").text}): start the separation near λL/period`
    : "";
  return `no significant fringe in these data at the fitted period: ${atFit}; separation, visibility and phase are not meaningful${elsewhere}`;
}
