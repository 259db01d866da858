/**
 * One batch row: fit one file and report its status, never throwing (a bad file is a row
 * with status "error" and the one-line message).
 */
import { FringekitError } from "../src/advanced.js";
import { fitFile } from "./commands/fit.js";
import { fitJson, type FitJson } from "./fitJson.js";
import { notConvergedText } from "./fitSettings.js";
import type { ParsedArgs } from "./parseArgs.js";
import { UsageError } from "./usageError.js";

/** Result of one file in a batch. */
export interface BatchRow {
  file: string;
  status: "ok" | "not-converged" | "error";
  /** Stop message, or the error. */
  message: string;
  /** The fit as `fringekit fit --json` prints it; null when the file could not be fitted. */
  fit: FitJson | null;
}

/**
 * Fits one file; any error becomes a row.
 * @param path    data file
 * @param modelId model id
 * @param args    parsed command line (fit settings and data options)
 */
export function batchRow(path: string, modelId: string, args: ParsedArgs): BatchRow {
  try {
    const { loaded, result, warnings, assumed } = fitFile(path, modelId, args);
    return { file: path, status: result.converged ? "ok" : "not-converged", message: result.converged ? result.message : notConvergedText(result), fit: fitJson(result, loaded.profile.provenance, warnings, assumed) };
  } catch (error) {
    const message = error instanceof FringekitError || error instanceof UsageError ? error.message : `internal error: ${error instanceof Error ? error.message : String(error)}`;
    return { file: path, status: "error", message, fit: null };
  }
}

/**
 * Rows → CSV: file, status, message, n, reducedChi2, aic, bic, then value and uncertainty (SI) of
 * every parameter.
 * @param rows batch rows in input order
 */
export function batchCsv(rows: readonly BatchRow[]): string {
  const names: string[] = [];
  for (const row of rows) for (const name of Object.keys(row.fit?.params ?? {})) if (!names.includes(name)) names.push(name);
  const header = ["file", "status", "message", "n", "reducedChi2", "aic", "bic", ...names.flatMap((n) => [n, `${n}_uncertainty`])];
  const lines = [header.map(csvCell).join(",")];
  for (const row of rows) {
    const s = row.fit?.stats;
    const cells: (string | number | null | undefined)[] = [row.file, row.status, row.message, s?.n, s?.reducedChi2, s?.aic, s?.bic];
    for (const name of names) cells.push(row.fit?.params[name]?.value, row.fit?.params[name]?.uncertainty);
    lines.push(cells.map((c) => csvCell(c === undefined || c === null ? "" : String(c))).join(","));
  }
  return `${lines.join("\n")}\n`;
}

function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
