/** `fringekit compare FILE --models A,B,... [fit settings] [--json]`. */
import { compareFits, comparisonDocument, comparisonJson, comparisonTable, fitCandidates, getModel, stringifyResults, tableToText, type FitResult } from "../../src/advanced.js";
import { DOUBTFUL_EXIT, doubtfulAdvice, doubtfulSummary } from "../doubtful.js";
import { fitSettings, notConvergedSummary } from "../fitSettings.js";
import { writeOutputFile } from "../files.js";
import { loadData } from "../loadData.js";
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";
import { FIT_OPTIONS } from "./fit.js";

/** Runs the compare command. */
export async function compareCommand(words: readonly string[]): Promise<CommandOutput> {
  const args = parseArgs(words, { ...FIT_OPTIONS, models: { kind: "value" } }, "compare");
  if (args.positionals.length !== 1) throw new UsageError(`compare needs exactly one data file (got ${args.positionals.length})`);
  const ids = (args.values.get("models") ?? "").split(",").map((s) => s.trim()).filter((s) => s !== "");
  if (ids.length < 2) throw new UsageError("compare needs at least two models: --models two-slit,n-slit");
  const path = args.positionals[0]!;
  const loaded = await loadData(path, args);
  const fitOptions: Record<string, unknown>[] = [];
  const candidates = ids.map((id) => {
    const model = getModel(id);
    // --set/--fix name parameters of any of the models; each model takes the ones it has.
    const own = (words: readonly string[]): string[] => words.filter((w) => model.parameters.some((p) => p.name === w.split("=")[0]!.trim()));
    const settings = fitSettings(model, own(args.lists.get("set") ?? []), own(args.lists.get("fix") ?? []), args.values.get("noise"), args.values.get("max-evaluations"));
    fitOptions.push({ ...settings });
    return { model, options: settings };
  });
  // Each model also starts from the others' fitted geometry (near field from far field and back).
  const fits: FitResult[] = fitCandidates(loaded.profile, candidates);
  // Default geometry and saturation are warnings of each result; the data's other notes stay here.
  const carried = new Set((loaded.profile.warnings ?? []).map((w) => w.message));
  const geometry = [...new Set(fits.flatMap((fit) => fit.warnings.filter((w) => w.code === "default-geometry" || carried.has(w.message)).map((w) => w.message)))];
  const notes = [...loaded.warnings.filter((w) => !carried.has(w)), ...geometry];
  const stuck = fits.map((fit, i) => ({ fit, id: ids[i]! })).filter(({ fit }) => !fit.converged);
  // compareFits ranks converged fits only; with none there is nothing to rank, but the fits are still reported.
  const comparison = stuck.length < fits.length ? compareFits(fits.map((fit, i) => ({ fit, label: ids[i]!, profile: loaded.profile })), { profile: loaded.profile }) : undefined;
  const verdict = comparison?.verdict ?? `No model converged, so none is preferred: ${notConvergedSummary(stuck)}.`;
  const text = args.flags.has("json")
    ? `${JSON.stringify(comparison ? comparisonJson(comparison) : { ranking: [], preferred: null, verdict }, null, 2)}\n`
    : comparison
      ? `${tableToText(comparisonTable(comparison, { verdict, notes, fits: fits.map((result, i) => ({ label: ids[i]!, result })) }))}\n`
      : `${[verdict, ...notes].join("\n")}\n`;
  const out = args.values.get("out");
  // A .json output is the versioned results file that `fringekit replay` re-runs.
  const document = (): string => stringifyResults(comparisonDocument(loaded.profile, fits.map((result, i) => ({ label: ids[i]!, result, fitOptions: fitOptions[i]! })), { verdict }));
  if (out !== undefined) writeOutputFile(out, out.endsWith(".json") ? document() : text, [path]);
  if (stuck.length === 0) {
    const doubtful = doubtfulSummary(fits.map((fit, i) => ({ label: ids[i]!, fit })));
    if (doubtful === "") return { stdout: text, exitCode: 0 };
    const accepted = args.flags.has("accept-doubtful");
    return { stdout: text, exitCode: accepted ? 0 : DOUBTFUL_EXIT, error: `${path}: every fit converged, but ${doubtful}; ${doubtfulAdvice(accepted)}` };
  }
  return { stdout: text, exitCode: 1, error: `${path}: not every fit converged (${notConvergedSummary(stuck)}); the result was still written` };
}
