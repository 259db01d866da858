/**
 * One table cell → number, saying exactly what is wrong with a cell that is not a finite number.
 */

// One way to split the digits only (no `\d+\.?\d*`), so a long digit run fails in linear time.
const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$|^[+-]?\d+,(?:[eE][+-]?\d+)?$/;
const NOT_FINITE = /^[+-]?(nan|inf|infinity|-?1\.#(ind|inf)0*)$/i;

/** A parsed cell: the number, or the reason it is not one. */
export type CellValue = { ok: true; value: number } | { ok: false; problem: string };

/**
 * Parses a decimal number cell ("1.5", "-2e-3", and "1,5" when `decimalComma`).
 * @param cell         trimmed cell text
 * @param decimalComma accept a comma as the decimal mark (semicolon- and tab-separated files)
 */
export function parseNumberCell(cell: string, decimalComma: boolean): CellValue {
  let text = cell.trim();
  if (text.startsWith('"') && text.endsWith('"') && text.length >= 2) text = text.slice(1, -1).trim();
  if (text === "") return { ok: false, problem: "an empty cell" };
  if (NUMBER.test(text)) return finite(Number(text), text);
  if (decimalComma && DECIMAL_COMMA.test(text)) return finite(Number(text.replace(",", ".")), text);
  if (NOT_FINITE.test(text)) return { ok: false, problem: `a non-finite value "${text}" (NaN or infinity)` };
  if (!decimalComma && DECIMAL_COMMA.test(text)) {
    return { ok: false, problem: `"${text}" with a decimal comma in a comma-separated file` };
  }
  return { ok: false, problem: `a non-numeric cell "${truncate(text)}"` };
}

function finite(value: number, text: string): CellValue {
  return Number.isFinite(value) ? { ok: true, value } : { ok: false, problem: `a value out of range "${truncate(text)}"` };
}

function truncate(text: string): string {
  return text.length > 24 ? `${text.slice(0, 21)}...` : text;
}
