/**
 * One batch row: fit one input (a data file, or one page of an image stack) and report its
 * status, never throwing (a bad file is a row with status "error" and the one-line message);
 * and the rows as a CSV table that is safe to open in a spreadsheet.
 */
import { DOUBTFUL_CODES, FringekitError, readFitJson } from "../src/advanced.js";
import { fitFile } from "./commands/fit.js";
import { fitJson, type FitJson } from "./fitJson.js";
import { notConvergedText } from "./fitSettings.js";
import type { ParsedArgs } from "./parseArgs.js";
import { UsageError } from "./usageError.js";

/** One input of a batch: a file, or one page (1 = first) of an image stack. */
export interface BatchInput {
  path: string;
  page?: number;
}

/** Result of one input in a batch. */
export interface BatchRow {
  file: string;
  /** Page of an image stack (1 = first), present only for `--page each`. */
  page?: number;
  /** "doubtful": converged, but a check says the fit cannot be trusted (poor fit, no fringe, aliased fringe). */
  status: "ok" | "doubtful" | "not-converged" | "error";
  /** Stop message, the checks' warnings of a doubtful fit, or the error. */
  message: string;
  /** The fit as `fringekit fit --json` prints it; null when the file could not be fitted. */
  fit: FitJson | null;
}

/**
 * Fits one input; any error becomes a row.
 * @param input   data file (and page of a stack)
 * @param modelId model id
 * @param args    parsed command line (fit settings and data options)
 */
export async function batchRow(input: BatchInput, modelId: string, args: ParsedArgs): Promise<BatchRow> {
  const where = input.page === undefined ? { file: input.path } : { file: input.path, page: input.page };
  try {
    const pageArgs = input.page === undefined ? args : withPage(args, input.page);
    const { loaded, result, warnings, assumed } = await fitFile(input.path, modelId, pageArgs);
    const fit = fitJson(result, loaded.profile.provenance, warnings, assumed);
    if (!result.converged) return { ...where, status: "not-converged", message: notConvergedText(result), fit };
    // A converged fit that a check calls doubtful says so in the row itself, not only in its JSON.
    const doubts = result.warnings.filter((w) => DOUBTFUL_CODES.includes(w.code)).map((w) => w.message);
    return doubts.length > 0 ? { ...where, status: "doubtful", message: doubts.join("; "), fit } : { ...where, status: "ok", message: result.message, fit };
  } catch (error) {
    const message = error instanceof FringekitError || error instanceof UsageError ? error.message : `internal error: ${error instanceof Error ? error.message : String(error)}`;
    return { ...where, status: "error", message, fit: null };
  }
}

function withPage(args: ParsedArgs, page: number): ParsedArgs {
  const values = new Map(args.values);
  values.set("page", String(page));
  return { ...args, values };
}

/**
 * Rows → CSV: file, [page,] status, message, n, reducedChi2, aic, bic, then value and uncertainty
 * (SI) of every parameter (in the order they first appear). Text cells are neutralised for
 * spreadsheets (see spreadsheetSafe); numbers are written as JavaScript prints them (shortest
 * text that reads back to the same double).
 * @param rows batch rows in input order
 */
export function batchCsv(rows: readonly BatchRow[]): string {
  // Rows of part files written before the one JSON shape of a fit are read too (readFitJson).
  const fits = rows.map((row) => (row.fit ? readFitJson(row.fit, row.file) : null));
  const names: string[] = [];
  for (const fit of fits) for (const name of Object.keys(fit?.params ?? {})) if (!names.includes(name)) names.push(name);
  const paged = rows.some((r) => r.page !== undefined);
  const header = ["file", ...(paged ? ["page"] : []), "status", "message", "n", "reducedChi2", "aic", "bic", ...names.flatMap((n) => [n, `${n}_uncertainty`])];
  const lines = [header.map(textCell).join(",")];
  rows.forEach((row, i) => {
    const fit = fits[i];
    const s = fit?.statistics as Record<string, number> | undefined;
    const cells: string[] = [textCell(row.file), ...(paged ? [numberCell(row.page)] : []), textCell(row.status), textCell(row.message), numberCell(s?.n), numberCell(s?.reducedChi2), numberCell(s?.aic), numberCell(s?.bic)];
    for (const name of names) cells.push(numberCell(fit?.params[name]?.value), numberCell(fit?.params[name]?.uncertainty));
    lines.push(cells.join(","));
  });
  return `${lines.join("\n")}\n`;
}

/** A number's cell; empty when missing or not finite (an uncertainty that could not be estimated). */
function numberCell(value: number | null | undefined): string {
  return value === undefined || value === null || !Number.isFinite(value) ? "" : String(value);
}

function textCell(text: string): string {
  return csvQuote(spreadsheetSafe(text));
}

/** A cell that a spreadsheet reads as a plain number (e.g. -0.5, +3, -1.2e-3), never as a formula. */
const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Text for a CSV cell that a spreadsheet will not run as a formula: a cell beginning with
 * =, +, -, @, tab or carriage return gets a leading apostrophe (which spreadsheets show as
 * "this is text" and hide), unless the whole cell is a plain number such as -0.5, which a
 * spreadsheet reads as that number and which cannot call anything. Number columns are never
 * touched; only text columns (file names, messages) pass through here.
 * @param text the cell text
 */
export function spreadsheetSafe(text: string): string {
  if (!/^[=+\-@\t\r]/.test(text) || PLAIN_NUMBER.test(text)) return text;
  return `'${text}`;
}

function csvQuote(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
