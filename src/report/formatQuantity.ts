/**
 * Value ± uncertainty with unit, ready for a table cell or a line of text:
 * uncertainty to two significant digits and the value to match (JCGM 100:2008, 7.2.6),
 * an SI prefix chosen for readability, and marks for fixed parameters and values at a bound.
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitParameter } from "../fit/types.js";
import { roundPair, roundSignificant } from "./rounding.js";
import { choosePrefix, prefixBySymbol, takesPrefix, type SiPrefix } from "./siPrefix.js";

/** Why a quantity carries no ordinary uncertainty, or a caveat on it. */
export type QuantityNote = "fixed" | "at lower bound" | "at upper bound" | "uncertainty not estimated" | "tied";

/** How to print a value ± uncertainty: digits, SI prefix, style. */
export interface FormatOptions {
  /** Significant digits of the uncertainty (GUM 7.2.6 says at most two; default 2). */
  digits?: number;
  /** "auto" (default) picks an SI prefix; "none" keeps the base unit; or a prefix symbol ("m", "µ"/"u", "n", ...). */
  prefix?: string;
  /** "pm": (632.80 ± 0.12) nm (default); "paren": 632.80(12) nm (GUM 7.2.2 concise form). */
  style?: "pm" | "paren";
  /** Significant digits for values shown without uncertainty (fixed parameters; default 6, trailing zeros dropped). */
  plainDigits?: number;
}

/** A formatted quantity; the parts let each table renderer (HTML, Markdown, LaTeX) typeset it. */
export interface FormattedQuantity {
  /** Rounded value in the display unit, ASCII digits with "-" for minus, e.g. "632.80". */
  value: string;
  /** Rounded uncertainty in the display unit, or null when none is shown. */
  uncertainty: string | null;
  /** Uncertainty digits for the "paren" style, e.g. "12"; null when none. */
  uncertaintyDigits: string | null;
  /** Display unit with prefix, e.g. "nm"; "" for dimensionless numbers. */
  unit: string;
  /** Base (SI) unit before the prefix, e.g. "m". */
  baseUnit: string;
  /** Power of ten of the prefix used (−9 for nm). */
  prefixExponent: number;
  note: QuantityNote | null;
  style: "pm" | "paren";
  /** The whole thing as plain text with a typographic minus, e.g. "(632.80 ± 0.12) nm". */
  text: string;
}

/**
 * Format `value` ± `uncertainty` (both SI, in `unit`) for reading.
 * uncertainty = 0 means "no uncertainty shown" (a known constant); Infinity or NaN means it
 * could not be estimated, which is said in the note rather than hidden.
 * Example: formatQuantity(6.32801e-7, 1.2e-10, "m").text → "(632.80 ± 0.12) nm".
 * @param value       best estimate (SI unit `unit`)
 * @param uncertainty standard uncertainty (same unit), ≥ 0, Infinity/NaN when unknown
 * @param unit        SI unit symbol ("m", "rad", "counts", "1" for dimensionless)
 */
export function formatQuantity(
  value: number,
  uncertainty: number,
  unit: string,
  options: FormatOptions = {},
  note: QuantityNote | null = null,
): FormattedQuantity {
  if (!Number.isFinite(value)) throw new InvalidArgumentError("value", value, "a finite number to format");
  if (uncertainty < 0) throw new InvalidArgumentError("uncertainty", uncertainty, "a number >= 0");
  const style = options.style ?? "pm";
  if (style !== "pm" && style !== "paren") throw new InvalidArgumentError("style", style, '"pm" or "paren"');
  const baseUnit = unit === "1" ? "" : unit;
  const known = Number.isFinite(uncertainty) && uncertainty > 0;
  const prefix = pickPrefix(baseUnit, value, known ? uncertainty : 0, options.prefix ?? "auto");
  const scale = 10 ** -prefix.exponent;
  const displayUnit = baseUnit === "" ? "" : `${prefix.symbol}${readableUnit(baseUnit)}`;
  const finalNote = note ?? (known || uncertainty === 0 ? null : "uncertainty not estimated");

  let valueText: string;
  let uncertaintyText: string | null = null;
  let digitsText: string | null = null;
  if (known) {
    const pair = roundPair(value * scale, uncertainty * scale, options.digits ?? 2);
    valueText = pair.value;
    uncertaintyText = pair.uncertainty;
    // Above the units digit, "20000(12)" would misread: then the parentheses hold the whole uncertainty.
    digitsText = pair.lastDigit > 0 ? pair.uncertainty : String(pair.uncertaintyDigits);
  } else {
    valueText = trimZeros(roundSignificant(value * scale, options.plainDigits ?? 6));
  }
  const quantity = { value: valueText, uncertainty: uncertaintyText, uncertaintyDigits: digitsText };
  return {
    ...quantity,
    unit: displayUnit,
    baseUnit: unit,
    prefixExponent: prefix.exponent,
    note: finalNote,
    style,
    text: plainText(quantity, displayUnit, style, finalNote),
  };
}

/**
 * Format one fitted parameter: value ± standard error with its unit, marked "fixed",
 * "tied", "at lower bound" or "at upper bound" where that applies.
 * @param parameter a FitParameter (SI values)
 */
export function formatParameter(parameter: FitParameter, options: FormatOptions = {}): FormattedQuantity {
  if (parameter.fixed) return formatQuantity(parameter.value, 0, parameter.unit, options, "fixed");
  if (parameter.tied !== null) return formatQuantity(parameter.value, parameter.uncertainty, parameter.unit, options, "tied");
  const note: QuantityNote | null =
    parameter.atBound === "lower" ? "at lower bound" : parameter.atBound === "upper" ? "at upper bound" : null;
  return formatQuantity(parameter.value, parameter.uncertainty, parameter.unit, options, note);
}

/** Replace ASCII "-" by the typographic minus U+2212 in a number string. */
export function typographicMinus(text: string): string {
  return text.replace(/-/g, "\u2212");
}

function pickPrefix(unit: string, value: number, uncertainty: number, wanted: string): SiPrefix {
  const none = { symbol: "", exponent: 0 };
  if (wanted === "none" || !takesPrefix(unit)) return none;
  if (wanted === "auto") return choosePrefix(Math.abs(value) >= uncertainty ? value : uncertainty);
  const prefix = prefixBySymbol(wanted);
  if (!prefix) throw new InvalidArgumentError("prefix", wanted, '"auto", "none" or an SI prefix from p to G');
  return prefix;
}

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "1": "¹", "2": "²", "3": "³", "4": "⁴" };

/** "m^-1" → "m⁻¹", "m^2" → "m²": exponents as superscripts, the way units are printed. */
export function readableUnit(unit: string): string {
  return unit.replace(/\^(-?[1-4])\b/g, (_m, exp: string) => [...exp].map((c) => SUPERSCRIPT[c]).join(""));
}

function trimZeros(text: string): string {
  return text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text;
}

function plainText(
  q: { value: string; uncertainty: string | null; uncertaintyDigits: string | null },
  unit: string,
  style: "pm" | "paren",
  note: QuantityNote | null,
): string {
  const unitPart = unit === "" ? "" : ` ${unit}`;
  let core: string;
  if (q.uncertainty === null) core = `${typographicMinus(q.value)}${unitPart}`;
  else if (style === "paren") core = `${typographicMinus(q.value)}(${q.uncertaintyDigits})${unitPart}`;
  else if (unit === "") core = `${typographicMinus(q.value)} ± ${q.uncertainty}`;
  else core = `(${typographicMinus(q.value)} ± ${q.uncertainty})${unitPart}`;
  return note === null ? core : `${core} (${note})`;
}
