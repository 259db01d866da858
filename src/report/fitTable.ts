/**
 * The table of one fit: every parameter as value ± standard uncertainty (GUM 7.2.6 rounding),
 * fixed/tied/at-bound marks, then the fit statistics and any warnings as notes.
 */
import { InvalidArgumentError } from "../errors.js";
import type { FringeDetection } from "../fit/fringeDetection.js";
import type { GoodnessOfFit } from "../fit/goodness.js";
import type { FitResult } from "../fit/types.js";
import { formatParameter, type FormatOptions } from "./formatQuantity.js";
import { parameterLabel, type ParameterLabel } from "./labels.js";
import type { ReportTable, ReportTableRow } from "./table.js";

/** Options of fitTable: caption, data name, number formats, notes. */
export interface FitTableOptions {
  /** Caption; default "Fit of model <id>". User text: escaped by every renderer. */
  caption?: string;
  /** Name of the data (e.g. the file name), shown in the caption's note line. */
  source?: string;
  /** Per-parameter format options (e.g. { separation: { prefix: "m" } } to print mm). */
  formats?: Record<string, FormatOptions>;
  /** Format options for every parameter (style, digits). */
  format?: FormatOptions;
  /** Extra notes printed under the table (user text, escaped). */
  notes?: string[];
  /** Show effects switched off (pixelWidth, blur, backgroundSlope, bandwidth fixed at 0) as rows; default false: one note names them. */
  showInactive?: boolean;
}

/** Optional effects that a value of exactly 0 switches off. */
const OPTIONAL_EFFECTS = new Set(["pixelWidth", "blur", "backgroundSlope", "bandwidth"]);

const STAT_LABELS: Record<string, ParameterLabel> = {
  n: { text: "points used n", html: "points used <i>n</i>", latex: "points used $n$" },
  k: { text: "free parameters k", html: "free parameters <i>k</i>", latex: "free parameters $k$" },
  chi2: { text: "χ²/ν", html: "<i>χ</i>²/<i>ν</i>", latex: "$\\chi^2/\\nu$" },
  lnL: { text: "ln L", html: "ln <i>L</i>", latex: "$\\ln L$" },
};

/** How each noise model is named in reports, e.g. "Poisson (deviance)". */
export const NOISE_WORDS: Record<string, string> = {
  gaussian: "Gaussian (least squares)",
  poisson: "Poisson (deviance)",
  robust: "robust (outliers down-weighted)",
};

/**
 * Build the report table of a fit. Uncertainties are the fit's standard errors (SI), rounded
 * to two significant digits; the statistics are χ² (dimensionless), log-likelihood (nats),
 * AIC and BIC.
 * @param result a FitResult from the fitter (SI values)
 */
export function fitTable(result: FitResult, options: FitTableOptions = {}): ReportTable {
  if (!result || !Array.isArray(result.parameters) || !result.statistics) {
    throw new InvalidArgumentError("result", typeof result, "a FitResult with parameters and statistics");
  }
  const inactive = options.showInactive ? [] : result.parameters.filter((p) => p.fixed && p.value === 0 && OPTIONAL_EFFECTS.has(p.name));
  const shown = result.parameters.filter((p) => !inactive.includes(p));
  const rows: ReportTableRow[] = shown.map((p) => ({
    cells: [{ label: parameterLabel(p.name) }, { quantity: formatParameter(p, { ...options.format, ...options.formats?.[p.name] }) }],
  }));
  const s = result.statistics;
  rows.push({ section: "Fit statistics" });
  rows.push({ cells: ["noise model", NOISE_WORDS[result.noise] ?? result.noise] });
  rows.push({ cells: [{ label: STAT_LABELS.n }, String(s.n)] });
  rows.push({ cells: [{ label: STAT_LABELS.k }, String(s.nFree)] });
  rows.push({ cells: [{ label: STAT_LABELS.chi2 }, `${fixed(s.chi2, 1)}/${s.dof} = ${fixed(s.reducedChi2, 3)}`] });
  rows.push({ cells: [{ label: STAT_LABELS.lnL }, fixed(s.logLikelihood, 1)] });
  rows.push({ cells: ["AIC", fixed(s.aic, 1)] });
  rows.push({ cells: ["BIC", fixed(s.bic, 1)] });
  const goodness = result.goodness;
  const doubtful = result.warnings.filter((w) => DOUBTFUL_CODES.includes(w.code));
  // "converged" is never the only word on a fit that a check calls doubtful.
  const convergedText = !result.converged ? `NO: ${result.message}` : doubtful.length > 0
    ? `yes (${result.message}), BUT ${doubtful.map((w) => DOUBTFUL_WORDS[w.code]).join(" and ")}: see the warnings`
    : `yes (${result.message})`;
  rows.push({ cells: ["converged", convergedText] });
  if (goodness) rows.push({ cells: ["goodness of fit", goodnessText(goodness)] });
  if (goodness?.fringes) rows.push({ cells: ["fringe detected", fringeText(goodness.fringes)] });

  const notes = [
    "Uncertainties are standard uncertainties rounded to two significant digits (JCGM 100:2008, 7.2.6)" +
      (result.covarianceScaled ? ", scaled by the reduced χ²." : ", not scaled by the reduced χ²."),
  ];
  if (inactive.length) notes.push(`Not included (fixed at 0): ${inactive.map((p) => parameterLabel(p.name).text).join(", ")}.`);
  if (options.source !== undefined) notes.push(`Data: ${options.source}`);
  for (const w of result.warnings) notes.push(`Warning (${w.code}${w.parameter ? `, ${w.parameter}` : ""}): ${w.message}`);
  if (result.flagged.length) notes.push(`${result.flagged.length} points flagged as outliers by the robust fit.`);
  notes.push(...(options.notes ?? []));
  return {
    caption: options.caption ?? `Fit of model ${result.modelId}`,
    columns: ["Parameter", "Value"],
    align: ["l", "l"],
    rows,
    notes,
  };
}

/** Warning codes that make a converged fit doubtful (the command exits with status 3 on them). */
export const DOUBTFUL_CODES = ["poor-fit", "no-fringes", "fringe-aliased"];

const DOUBTFUL_WORDS: Record<string, string> = {
  "poor-fit": "POOR FIT (the model does not describe these data)",
  "no-fringes": "NO SIGNIFICANT FRINGE",
  "fringe-aliased": "FRINGE PERIOD BELOW TWO SAMPLES (aliased)",
};

/** The goodness-of-fit cell: verdict in capitals when poor, then the test's sentence. */
export function goodnessText(g: GoodnessOfFit): string {
  if (g.verdict === "poor") return `POOR: ${g.summary}`;
  if (g.verdict === "not-tested") return g.summary.replace(/^goodness of fit /, "");
  return `${g.verdict}: ${g.summary}`;
}

/** The fringe-detection cell: yes/NO with the power ratio and period in samples. */
export function fringeText(d: FringeDetection): string {
  const ratio = d.fittedPowerRatio ?? d.powerRatio;
  const alarm = d.fittedFalseAlarm ?? d.falseAlarm;
  const period = d.fittedPeriodSamples ?? d.peakPeriodSamples;
  const head = d.significant ? "yes" : "NO";
  const aliased = d.fittedPeriodSamples !== undefined && d.fittedPeriodSamples < 2 ? "; ALIASED (below 2 samples)" : "";
  return `${head}: period ${period.toPrecision(3)} samples, power ${ratio.toPrecision(3)}× the noise floor, false-alarm probability ${alarm < 1e-300 ? "< 1e-300" : alarm.toPrecision(2)}${aliased}`;
}

/** `x` (any unit, printed as given) with `decimals` fixed decimals and a typographic minus; "∞"/"NaN" spelled out. */
export function fixed(x: number, decimals: number): string {
  if (Number.isNaN(x)) return "NaN";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  const text = x.toFixed(decimals);
  return (/^-0\.?0*$/.test(text) ? text.slice(1) : text).replace("-", "\u2212");
}
