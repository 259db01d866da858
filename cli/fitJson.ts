/**
 * The JSON object `fringekit fit --json` prints: the one JSON shape of a fit (src/report/results/
 * fitJson: parameters keyed by name, SI values, a number that is not finite written as
 * {"nonFinite": "Infinity"}), with the data's warnings first among the warnings and where the
 * data came from.
 */
import { fitJson as fitJsonOf, type FitJson as OneFitJson, type FitResult, type Provenance } from "../src/advanced.js";
import type { AssumedDefault } from "./fitSettings.js";

/** The documented shape of `fringekit fit --json`: the JSON of a fit plus `provenance`. */
export interface FitJson extends OneFitJson {
  provenance: Provenance | null;
}

/**
 * Builds the JSON object of a fit.
 * @param result     the fit
 * @param provenance where the data came from
 * @param dataWarnings warnings met while reading the data
 * @param assumed    parameters held at model defaults the user did not give (see assumedDefaults)
 */
export function fitJson(result: FitResult, provenance: Provenance | undefined, dataWarnings: readonly string[], assumed: readonly AssumedDefault[] = []): FitJson {
  const json = fitJsonOf(result);
  return {
    ...json,
    warnings: [...dataWarnings.map((message) => ({ code: "data", message })), ...assumed.map((a) => ({ code: a.code, message: a.message, parameter: a.parameter })), ...json.warnings],
    provenance: provenance ?? null,
  };
}
