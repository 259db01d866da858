/** `fringekit fit FILE [--model ID] [--set ...] [--fix ...] [--noise ...] [--json] [--out FILE]`. */
import { checkCountsForPoisson, fitDocument, fitFigure, fitProfile, fitTable, getModel, stringifyResults, tableToText, type FitResult, type LoadedProfile } from "../../src/advanced.js";
import type { CommandFitOptions } from "../engine.js";
import { fitJson } from "../fitJson.js";
import { DOUBTFUL_EXIT, doubtfulAdvice, doubtfulSummary } from "../doubtful.js";
import { assumedDefaults, fitSettings, notConvergedText, type AssumedDefault } from "../fitSettings.js";
import { checkOutputPath, writeOutputFile } from "../files.js";
import { DATA_OPTIONS, loadData } from "../loadData.js";
import { parseArgs, type ParsedArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";

/** Options of fit (and compare, which shares the fit settings). */
export const FIT_OPTIONS = {
  ...DATA_OPTIONS,
  set: { kind: "list" },
  fix: { kind: "list" },
  noise: { kind: "value" },
  "max-evaluations": { kind: "value" },
  json: { kind: "flag" },
  out: { kind: "value" },
  "accept-doubtful": { kind: "flag" },
} as const;

/** Default model when --model is not given. */
export const DEFAULT_MODEL = "two-slit";

/** Fits one file with one model. */
export async function fitFile(path: string, modelId: string, args: ParsedArgs): Promise<{ loaded: LoadedProfile; result: FitResult; warnings: string[]; assumed: AssumedDefault[]; settings: CommandFitOptions }> {
  const loaded = await loadData(path, args);
  const model = getModel(modelId);
  const settings = fitSettings(model, args.lists.get("set") ?? [], args.lists.get("fix") ?? [], args.values.get("noise"), args.values.get("max-evaluations"));
  const warnings = [...loaded.warnings];
  if (settings.noise === "poisson") warnings.push(...checkCountsForPoisson(loaded.profile));
  const result = fitProfile(loaded.profile, model, settings);
  return { loaded, result, warnings, assumed: assumedDefaults(model, settings), settings };
}

/** Runs the fit command. */
export async function fitCommand(words: readonly string[]): Promise<CommandOutput> {
  const args = parseArgs(words, { ...FIT_OPTIONS, model: { kind: "value" }, figure: { kind: "value" } }, "fit");
  if (args.positionals.length !== 1) throw new UsageError(`fit needs exactly one data file (got ${args.positionals.length})`);
  const path = args.positionals[0]!;
  const figure = args.values.get("figure");
  if (figure !== undefined && !/\.(svg|pdf|png)$/i.test(figure)) throw new UsageError(`invalid --figure: "${figure}" (a file name ending in .svg, .pdf or .png)`);
  if (figure !== undefined) checkOutputPath(figure, [path]);
  const out = args.values.get("out");
  if (out !== undefined) checkOutputPath(out, [path]);
  const { loaded, result, warnings, assumed, settings } = await fitFile(path, args.values.get("model") ?? DEFAULT_MODEL, args);
  // Default geometry and saturation are warnings of the result itself now (codes default-geometry, saturated-masked).
  void assumed;
  const carried = new Set((loaded.profile.warnings ?? []).map((w) => w.message));
  const dataOnly = warnings.filter((w) => !carried.has(w));
  const json = fitJson(result, loaded.profile.provenance, dataOnly);
  const notes = dataOnly;
  const text = args.flags.has("json") ? `${JSON.stringify(json, null, 2)}\n` : `${tableToText(fitTable(result, { source: loaded.profile.provenance?.source ?? path, notes }))}\n`;
  // A .json output is the versioned results file that `fringekit replay` re-runs; other names get the printed text.
  if (out !== undefined) writeOutputFile(out, out.endsWith(".json") ? stringifyResults(fitDocument(loaded.profile, { result, fitOptions: { ...settings } })) : text, [path]);
  if (figure !== undefined) {
    // Loaded only when asked for: figure export starts a headless Chromium.
    const { exportFigure } = await import("../../kernel-ext/figures/exportFigure.js");
    await exportFigure(fitFigure(loaded.profile, result), figure);
  }
  if (!result.converged) {
    return { stdout: text, exitCode: 1, error: `${path}: the fit did not converge (${notConvergedText(result)}); the result was still written` };
  }
  const doubtful = doubtfulSummary([{ label: "", fit: result }]);
  if (doubtful === "") return { stdout: text, exitCode: 0 };
  const accepted = args.flags.has("accept-doubtful");
  return { stdout: text, exitCode: accepted ? 0 : DOUBTFUL_EXIT, error: `${path}: converged, but ${doubtful}; ${doubtfulAdvice(accepted)}` };
}
