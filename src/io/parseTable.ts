/**
 * Text table (CSV, TSV, semicolon, whitespace) → Profile in SI units, with provenance.
 */
import { DataError, InvalidArgumentError } from "../errors.js";
import type { Profile } from "../profile.js";
import { checkPlausibleLength } from "../units/plausibility.js";
import { isCountUnit, isIntensityUnit, isPixelUnit, parseColumnHeader, positionUnitFactor, type ColumnHeader } from "../units/index.js";
import { checkPositions } from "./checkPositions.js";
import { chooseColumns, isPositionName, type ColumnRef } from "./chooseColumns.js";
import { decodeText } from "./decodeText.js";
import { findSaturationCode, flaggedRanges } from "./findSaturation.js";
import { MAX_TABLE_ROWS, checkFileSize } from "./limits.js";
import { parseNumberCell } from "./parseNumberCell.js";
import { sha256Hex } from "./sha256.js";
import { splitTableLines, type Delimiter } from "./splitTableLines.js";
import { utf8Encode } from "./utf8Encode.js";

/** Options for reading a table. Column numbers start at 1. */
export interface TableOptions {
  /** File name used in messages and provenance (default "table"). */
  source?: string;
  /** Position column (name or number); default: the first column. */
  x?: ColumnRef;
  /** Intensity column (name or number); default: an intensity-like name or the second column. */
  y?: ColumnRef;
  /** σ column (name or number), or false for none; default: a column named sigma, err, <y>_sigma, ... */
  sigma?: ColumnRef | false;
  /** Pixel pitch (m) when positions are pixel indices. */
  pixelPitch?: number;
  /** Unit of the position column when the header gives none (e.g. "mm", "px"). */
  xUnit?: string;
  /** Force a delimiter instead of detecting it. */
  delimiter?: Delimiter;
  /**
   * Mask samples sitting on a detector top code (255, 1023, 4095, 16383, 65535) when at least two
   * samples share it. Default true, as for frames: a clipped sample carries no intensity
   * information and biases the visibility low. false keeps them (with a "saturated-kept" warning).
   */
  maskSaturated?: boolean;
  /** SHA-256 of the file bytes when already known (hex). */
  sha256?: string;
}

/** A loaded profile and the warnings met on the way (also kept in provenance.notes). */
export interface LoadedProfile {
  profile: Profile;
  warnings: string[];
}

/** Fewest data rows accepted for a profile. */
export const MIN_TABLE_ROWS = 3;

/**
 * Reads a table from the bytes of a file (UTF-8 text; SHA-256 of the bytes goes into provenance).
 * @param bytes   the file content
 * @param options column choice, units, pixel pitch
 */
export function readTable(bytes: Uint8Array, options: TableOptions = {}): LoadedProfile {
  const source = options.source ?? "table";
  checkFileSize(bytes.length, source, "table");
  return parseTable(decodeText(bytes, source), { ...options, sha256: options.sha256 ?? sha256Hex(bytes) });
}

/**
 * Parses a table's text into a Profile: x in metres (from the header unit, or pixel index ×
 * pitch), y as read, σ when there is a σ column, mask = 1 except masked saturated samples.
 * Errors name the file and the line.
 * @param text    the table
 * @param options column choice, units, pixel pitch
 */
export function parseTable(text: string, options: TableOptions = {}): LoadedProfile {
  const source = options.source ?? "table";
  const split = splitTableLines(text, options.delimiter);
  if (split.rows.length === 0) {
    throw new DataError(source, split.leadingComments.length > 0 ? "only comment lines, no data" : "the file is empty", "give a table with a position column and an intensity column");
  }
  const decimalComma = split.delimiter === ";" || split.delimiter === "\t";
  const first = split.rows[0]!;
  // A header row has no numeric cell; a data row with one bad cell is reported, not taken as a header.
  const firstIsHeader = first.cells.every((cell) => !parseNumberCell(cell, decimalComma).ok && !/^[+-]?(nan|inf)/i.test(cell.trim()));
  let headers: ColumnHeader[];
  let dataRows = split.rows;
  if (firstIsHeader) {
    headers = mergeUnitCells(first.cells, split.delimiter).map((cell) => parseColumnHeader(checkHeaderCell(cell, source, first.line)));
    dataRows = split.rows.slice(1);
  } else {
    headers = headerFromComment(split.leadingComments, split.delimiter, first.cells.length) ?? first.cells.map(() => ({ name: "", unit: "", raw: "" }));
  }
  if (dataRows.length === 0) {
    throw new DataError(source, "a header row but no data rows", "add the measured rows below the header", first.line);
  }
  if (dataRows.length > MAX_TABLE_ROWS) {
    throw new DataError(source, `${dataRows.length} rows, above the ${MAX_TABLE_ROWS} row limit`, "split the file into smaller tables");
  }
  const columns = chooseColumns(headers, options, source);
  const label = (index: number): string => headers[index]?.name || `column ${index + 1}`;
  const width = headers.length;
  const n = dataRows.length;
  const rawX = new Float64Array(n);
  const y = new Float64Array(n);
  const sigma = columns.sigma !== undefined ? new Float64Array(n) : undefined;
  const lines = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const row = dataRows[i]!;
    lines[i] = row.line;
    if (row.cells.length < width && Math.max(columns.x, columns.y, columns.sigma ?? 0) >= row.cells.length) {
      throw new DataError(source, `${row.cells.length} cell${row.cells.length === 1 ? "" : "s"} where ${width} are expected`, "complete or remove that row", row.line);
    }
    if (row.cells.length > width) {
      // Extra cells shift the columns: usually decimal commas in a comma-separated file.
      const hint = split.delimiter === "," ? "decimal commas? save the file with ; as separator, or use decimal points" : "remove the extra cells or add a header for them";
      throw new DataError(source, `${row.cells.length} cells where ${width} are expected`, hint, row.line);
    }
    const read = (index: number): number => {
      const cell = parseNumberCell(row.cells[index] ?? "", decimalComma);
      if (!cell.ok) throw new DataError(source, `${cell.problem} in column "${label(index)}"`, "fix the value, delete the row, or comment it out with #", row.line);
      return cell.value;
    };
    rawX[i] = read(columns.x);
    y[i] = read(columns.y);
    if (sigma) {
      const value = read(columns.sigma!);
      if (!(value > 0)) throw new DataError(source, `σ must be positive, found ${value} in column "${label(columns.sigma!)}"`, "give σ > 0 or drop the σ column", row.line);
      sigma[i] = value;
    }
  }
  if (n < MIN_TABLE_ROWS) {
    throw new DataError(source, `only ${n} data row${n === 1 ? "" : "s"}`, `a profile needs at least ${MIN_TABLE_ROWS} points`);
  }
  const notes: string[] = [];
  const warnings: string[] = [];
  const scale = positionScale(headers[columns.x]!, rawX, options, source, label(columns.x), notes);
  if (checkPositions(rawX, lines, source, label(columns.x)) === "decreasing") {
    rawX.reverse();
    y.reverse();
    sigma?.reverse();
    notes.push("rows were in decreasing position order and were reversed");
  }
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = rawX[i]! * scale;
  const yUnitText = headers[columns.y]!.unit;
  if (yUnitText !== "" && !isIntensityUnit(yUnitText)) {
    throw new DataError(source, `the unit "${yUnitText}" of column "${label(columns.y)}" is not an intensity unit`, "use counts, a.u., V, W or no unit", first.line);
  }
  if (columns.sigma !== undefined) {
    const sigmaUnit = headers[columns.sigma]!.unit;
    if (sigmaUnit !== "" && yUnitText !== "" && sigmaUnit.toLowerCase() !== yUnitText.toLowerCase()) {
      throw new DataError(source, `the σ column "${label(columns.sigma)}" is in "${sigmaUnit}" but the intensity is in "${yUnitText}"`, "give σ in the unit of the intensity", first.line);
    }
  }
  const integers = y.every((value) => Number.isInteger(value) && value >= 0);
  const counts = yUnitText !== "" ? isCountUnit(yUnitText) && integers : integers;
  if (yUnitText !== "" && isCountUnit(yUnitText) && !integers) {
    warnings.push(`column "${label(columns.y)}" is labelled ${yUnitText} but holds negative or non-integer values; the Poisson noise model does not apply`);
  }
  const mask = new Uint8Array(n).fill(1);
  const coded: { code: string; message: string }[] = [];
  const top = findSaturationCode(y, 2);
  if (top !== undefined) {
    const flag = new Uint8Array(n);
    let count = 0;
    for (let i = 0; i < n; i++) if (y[i] === top) { flag[i] = 1; count++; }
    const where = flaggedRanges(flag).slice(0, 3).map(([a, b]) => formatRange(x[a]!, x[b]!)).join(", ");
    const ranges = flaggedRanges(flag).length;
    const more = ranges > 3 ? ` and ${ranges - 3} more range${ranges - 3 === 1 ? "" : "s"}` : "";
    if (options.maskSaturated !== false) {
      for (let i = 0; i < n; i++) if (flag[i] === 1) mask[i] = 0;
      const message = `${count} saturated samples (at the detector top code ${top}) masked at x = ${where}${more}; keep them with the keep-saturated option`;
      warnings.push(message);
      coded.push({ code: "saturated-masked", message });
    } else {
      const message = `${count} samples sit at the detector top code ${top} (saturated) at x = ${where}${more} and were kept as asked; clipped samples bias the visibility low`;
      warnings.push(message);
      coded.push({ code: "saturated-kept", message });
    }
  }
  const profile: Profile = {
    x,
    y,
    ...(sigma ? { sigma } : {}),
    mask,
    yUnit: yUnitText !== "" ? yUnitText : counts ? "counts" : "a.u.",
    counts,
    provenance: {
      source,
      sha256: options.sha256 ?? sha256Hex(utf8Encode(text)),
      options: provenanceOptions(options, headers, columns, split.delimiter),
      notes: [...notes, ...warnings],
    },
    ...(coded.length > 0 ? { warnings: coded } : {}),
  };
  return { profile, warnings };
}

function positionScale(header: ColumnHeader, rawX: Float64Array, options: TableOptions, source: string, label: string, notes: string[]): number {
  let unitText = header.unit !== "" ? header.unit : (options.xUnit ?? "");
  if (unitText === "" && (isPixelUnit(header.name) || consecutiveIntegers(rawX))) unitText = "px";
  if (unitText === "") {
    throw new DataError(source, `the position column "${label}" has no unit`, 'write it in the header, e.g. "position [mm]", or give the unit of x (--x-unit mm)');
  }
  if (isPixelUnit(unitText)) {
    if (options.pixelPitch === undefined) {
      throw new DataError(source, `the position column "${label}" holds pixel indices`, "give the pixel pitch (--pixel-pitch 5.5 um)");
    }
    if (!(options.pixelPitch > 0) || !Number.isFinite(options.pixelPitch)) throw new InvalidArgumentError("pixelPitch", options.pixelPitch, "a positive length in metres");
    checkPlausibleLength("pixelPitch", options.pixelPitch, "pixelPitch");
    notes.push(`positions are pixel indices × pitch ${options.pixelPitch} m`);
    return options.pixelPitch;
  }
  const factor = positionUnitFactor(unitText);
  if (factor === undefined) {
    throw new DataError(source, `the unit "${unitText}" of column "${label}" is not a length`, "use m, mm, um, nm or px for positions", undefined);
  }
  return factor;
}

/** In space-separated headers, "position [mm]" splits into two cells: join a bracketed unit to its name. */
/** Longest header cell (characters): column names with units are short; the header parser's cost grows with length. */
export const MAX_HEADER_CELL = 200;

/** Returns `cell`, or throws a DataError when it is longer than MAX_HEADER_CELL. */
function checkHeaderCell(cell: string, source: string, line: number): string {
  if (cell.length > MAX_HEADER_CELL) {
    throw new DataError(source, `a header cell of ${cell.length} characters, above the limit of ${MAX_HEADER_CELL}`, "shorten the column names (e.g. \"position [mm]\")", line);
  }
  return cell;
}

function mergeUnitCells(cells: string[], delimiter: Delimiter): string[] {
  if (delimiter !== "whitespace") return cells;
  const out: string[] = [];
  for (const cell of cells) {
    if (/^[[(]/.test(cell) && out.length > 0) out[out.length - 1] += ` ${cell}`;
    else out.push(cell);
  }
  return out;
}

function consecutiveIntegers(values: Float64Array): boolean {
  if (values.length < 3 || !Number.isInteger(values[0])) return false;
  for (let i = 1; i < values.length; i++) if (values[i]! - values[i - 1]! !== 1) return false;
  return true;
}

function headerFromComment(comments: string[], delimiter: Delimiter, width: number): ColumnHeader[] | undefined {
  const last = comments[comments.length - 1];
  if (last === undefined) return undefined;
  const cells = delimiter === "whitespace" ? last.split(/\s{2,}|\t/) : last.split(delimiter);
  if (cells.length !== width) return undefined;
  if (cells.some((cell) => cell.length > MAX_HEADER_CELL)) return undefined; // a long comment is prose, not a header
  const headers = cells.map(parseColumnHeader);
  return headers.some((h) => isPositionName(h.name) || h.unit !== "") ? headers : undefined;
}

function provenanceOptions(options: TableOptions, headers: ColumnHeader[], columns: { x: number; y: number; sigma: number | undefined }, delimiter: Delimiter): Record<string, unknown> {
  const out: Record<string, unknown> = {
    format: "table",
    delimiter: delimiter === "\t" ? "tab" : delimiter,
    columns: { x: headers[columns.x]?.raw || columns.x + 1, y: headers[columns.y]?.raw || columns.y + 1, sigma: columns.sigma === undefined ? null : headers[columns.sigma]?.raw || columns.sigma + 1 },
  };
  if (options.pixelPitch !== undefined) out["pixelPitch"] = options.pixelPitch;
  if (options.xUnit !== undefined) out["xUnit"] = options.xUnit;
  out["maskSaturated"] = options.maskSaturated !== false;
  return out;
}

/** "3.10–3.31 mm" for a position range in metres. */
export function formatRange(a: number, b: number): string {
  const mm = (v: number): string => (v * 1e3).toPrecision(4).replace(/\.?0+$/, "");
  return a === b ? `${mm(a)} mm` : `${mm(a)}–${mm(b)} mm`;
}
