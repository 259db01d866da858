/**
 * Which table columns hold position, intensity and σ: by name, by number (1 = first), or by
 * the usual names when not given.
 */
import { DataError, InvalidArgumentError } from "../errors.js";
import type { ColumnHeader } from "../units/index.js";

/** A column given by header name (case-insensitive, unit ignored) or by number (1 = first). */
export type ColumnRef = string | number;

/** Indices (0-based) of the chosen columns. */
export interface ColumnChoice {
  x: number;
  y: number;
  sigma: number | undefined;
}

const X_NAMES = /^(x|pos|position|positions|z|s|pixel|pixels|px|index|idx|distance|separation|baseline|displacement|coordinate)$/;
const Y_NAMES = /^(y|i|intensity|counts|count|signal|value|values|irradiance|power|visibility|v|adu|dn|mean|data)$/;
const SIGMA_NAMES = /^(sigma|err|error|errors|uncertainty|unc|std|stdev|stddev|stderr|sd|dy|delta|σ)$/;

/**
 * Chooses the columns. Position: `x` or the first column. Intensity: `y`, else a column with an
 * intensity-like name, else the first other non-σ column. σ: `sigma`, else a column named
 * sigma/err/…, `<y>_sigma`, `<y>_err` or `d<y>`; `sigma: false` uses none.
 * @param headers one per column (names empty when the file has no header)
 * @param options column references
 * @param source  file name for messages
 */
export function chooseColumns(
  headers: readonly ColumnHeader[],
  options: { x?: ColumnRef; y?: ColumnRef; sigma?: ColumnRef | false },
  source: string,
): ColumnChoice {
  const count = headers.length;
  if (count < 2) {
    throw new DataError(source, `only ${count} column found`, "a profile needs a position column and an intensity column (separated by commas, semicolons, tabs or spaces)");
  }
  const find = (ref: ColumnRef, role: string): number => resolve(headers, ref, role, source);
  const x = options.x !== undefined ? find(options.x, "x") : 0;
  const isSigmaName = (h: ColumnHeader, yName: string): boolean =>
    SIGMA_NAMES.test(h.name) || (yName !== "" && [`${yName}_sigma`, `${yName}_err`, `${yName}_error`, `d${yName}`, `${yName} sigma`, `${yName} err`].includes(h.name)) || /_(sigma|err|error|unc)$/.test(h.name);
  let y: number;
  if (options.y !== undefined) y = find(options.y, "y");
  else {
    const named = headers.findIndex((h, i) => i !== x && Y_NAMES.test(h.name));
    y = named >= 0 ? named : headers.findIndex((h, i) => i !== x && !isSigmaName(h, ""));
    if (y < 0) y = x === 0 ? 1 : 0;
  }
  if (y === x) throw new InvalidArgumentError("y column", options.y, "a different column from the position column");
  let sigma: number | undefined;
  if (options.sigma === false) sigma = undefined;
  else if (options.sigma !== undefined) sigma = find(options.sigma, "sigma");
  else {
    const yName = headers[y]?.name ?? "";
    const found = headers.findIndex((h, i) => i !== x && i !== y && h.name !== "" && isSigmaName(h, yName));
    sigma = found >= 0 ? found : undefined;
  }
  if (sigma === x || sigma === y) throw new InvalidArgumentError("sigma column", options.sigma, "a column other than position and intensity");
  return { x, y, sigma };
}

/** Whether a header name looks like a position column (used to detect header rows). */
export function isPositionName(name: string): boolean {
  return X_NAMES.test(name);
}

function resolve(headers: readonly ColumnHeader[], ref: ColumnRef, role: string, source: string): number {
  const names = headers.map((h) => h.name).filter((name) => name !== "");
  if (typeof ref === "number" || /^\d+$/.test(ref)) {
    const index = Number(ref) - 1;
    if (!Number.isInteger(index) || index < 0 || index >= headers.length) {
      throw new InvalidArgumentError(`${role} column`, ref, `a column number from 1 to ${headers.length}`);
    }
    return index;
  }
  const wanted = ref.trim().toLowerCase();
  const index = headers.findIndex((h) => h.name === wanted || h.raw.trim().toLowerCase() === wanted);
  if (index < 0) {
    throw new DataError(
      source,
      `no column named "${ref}" for ${role}`,
      names.length > 0 ? `the columns are ${names.map((n) => `"${n}"`).join(", ")}` : "the file has no header row; give the column by number (1 = first)",
    );
  }
  return index;
}
