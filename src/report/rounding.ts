/**
 * Rounding of a measured value to match its uncertainty, as JCGM 100:2008 (GUM) 7.2.6 asks:
 * the uncertainty to (at most) two significant digits, the value to the same decimal place.
 */
import { InvalidArgumentError } from "../errors.js";

/** A value and its uncertainty rounded together; both strings share the last decimal place. */
export interface RoundedPair {
  /** Rounded value as a plain decimal string (no exponent), e.g. "10.058". */
  value: string;
  /** Rounded uncertainty as a plain decimal string, e.g. "0.027". */
  uncertainty: string;
  /** Power of ten of the last kept digit: −3 for "10.058". */
  lastDigit: number;
  /** The rounded uncertainty's significant digits as an integer, e.g. 27 (for the "10.058(27)" form). */
  uncertaintyDigits: number;
}

/**
 * Round `uncertainty` to `digits` significant digits (round half up) and `value` to the same
 * decimal place (JCGM 100:2008, 7.2.6). Both must be finite, the uncertainty > 0.
 * Units are whatever the caller uses; the numbers are only rounded, never rescaled.
 * Example: roundPair(10.05762, 0.027) → { value: "10.058", uncertainty: "0.027", lastDigit: -3 }.
 * @param value       best estimate (any unit)
 * @param uncertainty standard uncertainty (same unit), > 0
 * @param digits      significant digits of the uncertainty, 1–4 (default 2)
 */
export function roundPair(value: number, uncertainty: number, digits = 2): RoundedPair {
  if (!Number.isFinite(value)) throw new InvalidArgumentError("value", value, "a finite number");
  if (!Number.isFinite(uncertainty) || uncertainty <= 0) {
    throw new InvalidArgumentError("uncertainty", uncertainty, "a finite number > 0");
  }
  if (!Number.isInteger(digits) || digits < 1 || digits > 4) {
    throw new InvalidArgumentError("digits", digits, "an integer from 1 to 4");
  }
  // toPrecision rounds in decimal and tells us where the leading digit ended up (handles 0.0996 → 0.10).
  const [mantissa, exponentText] = uncertainty.toExponential(digits - 1).split("e");
  const exponent = Number(exponentText);
  const lastDigit = exponent - (digits - 1);
  const uncertaintyDigits = Number(mantissa.replace(".", ""));
  return {
    value: fixedAt(value, lastDigit),
    uncertainty: fixedAt(uncertainty, lastDigit),
    lastDigit,
    uncertaintyDigits,
  };
}

/**
 * Round `value` to `significant` significant digits and print it without an exponent,
 * trimming nothing (so 0.5 with 3 digits gives "0.500"). For values with no uncertainty.
 * @param value       any finite number
 * @param significant significant digits, 1–17
 */
export function roundSignificant(value: number, significant: number): string {
  if (!Number.isFinite(value)) throw new InvalidArgumentError("value", value, "a finite number");
  if (value === 0) return significant > 1 ? `0.${"0".repeat(significant - 1)}` : "0";
  const exponent = Number(value.toExponential(significant - 1).split("e")[1]);
  return fixedAt(value, exponent - (significant - 1));
}

/** Print `value` (any unit, printed as given) rounded to the decimal place 10^lastDigit, as a plain decimal string. */
export function fixedAt(value: number, lastDigit: number): string {
  if (lastDigit <= 0) {
    const places = -lastDigit;
    if (places <= 100) return normaliseZero(value.toFixed(places));
  }
  // Rounding to tens, hundreds, ...: scale, round half away from zero, print as an integer.
  const step = 10 ** lastDigit;
  const rounded = Math.sign(value) * Math.round(Math.abs(value) / step);
  return normaliseZero(bigIntegerText(rounded, lastDigit));
}

function bigIntegerText(scaled: number, zeros: number): string {
  if (scaled === 0) return "0";
  return `${scaled.toFixed(0)}${"0".repeat(Math.max(0, zeros))}`;
}

/** "-0.00" reads like a sign error in a table: print it as "0.00". */
function normaliseZero(text: string): string {
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}
