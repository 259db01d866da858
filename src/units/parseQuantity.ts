/**
 * Parsing of physical quantities typed by people ("532nm", "532 nm", "0.85m", "5.5 µm")
 * into SI numbers, with fringekit's own unit tables (unitTable.ts), so reading a unit never
 * loads a general unit library.
 */
import { InvalidArgumentError } from "../errors.js";
import { lookupUnitExpression } from "./unitTable.js";

/** The physical kinds of quantity fringekit accepts at its edges. */
export type QuantityKind = "length" | "angle" | "dimensionless";

const SI_UNIT: Record<QuantityKind, string> = { length: "m", angle: "rad", dimensionless: "1" };

/** A parsed quantity: SI value and the unit text as the user wrote it. */
export interface Quantity {
  /** Value in SI units (m, rad, or a pure number). */
  value: number;
  /** SI unit symbol of `value` ("m", "rad", "1"). */
  unit: string;
  /** Unit as written by the user ("" when none was given). */
  written: string;
}

/**
 * Rewrites the micro signs (U+00B5, U+03BC) into "u", "micron" into "um" and "degree" into "deg".
 * @param text unit or quantity text
 */
export function normalizeUnitText(text: string): string {
  return text
    .trim()
    .replace(/[\u00b5\u03bc]/g, "u")
    .replace(/\bmicrons?\b/g, "um")
    .replace(/\bdegrees?\b/g, "deg");
}

/**
 * Parses a unit without a number ("mm", "nm", "mrad", "deg") and returns the factor that
 * converts a value in it to SI, or undefined when it is not a unit of that kind.
 * @param text unit text, e.g. "mm" → 0.001 (metres per millimetre)
 * @param kind the physical kind the unit must have
 */
export function unitFactor(text: string, kind: QuantityKind): number | undefined {
  const clean = normalizeUnitText(text);
  if (clean === "" || clean === "1") return kind === "dimensionless" ? 1 : undefined;
  const known = lookupUnitExpression(clean);
  return known && known.dimension === kind ? known.factor : undefined;
}

/** mathjs's order of base dimensions in Unit.dimensions (mass, length, time, current, temperature, luminous intensity, amount, angle, bit). */
const MATHJS_DIMENSION_INDEX: Record<"length" | "angle", number> = { length: 1, angle: 7 };

/**
 * True when a mathjs Unit's dimension matches the kind (for callers that already hold a mathjs
 * Unit). Typed by the one field it reads, so fringekit's declarations do not pull in mathjs's
 * (~250 KB that every cell importing "fringekit" would otherwise type-check).
 */
export function hasKind(parsed: { readonly dimensions: readonly number[] }, kind: QuantityKind): boolean {
  const dims = parsed.dimensions;
  if (kind === "dimensionless") return dims.every((d) => d === 0);
  const at = MATHJS_DIMENSION_INDEX[kind];
  return dims.every((d, i) => d === (i === at ? 1 : 0));
}

/**
 * Parses "VALUE[UNIT]" with or without a space ("532nm", "532 nm", "0.85m", "1e-3 m", "2 mrad")
 * into an SI value. A bare number is taken in `defaultUnit` (SI when omitted).
 * @param text        the quantity as typed
 * @param kind        the physical kind expected ("length" → metres, "angle" → radians)
 * @param argument    name used in the error message (e.g. "--set wavelength")
 * @param defaultUnit unit of a bare number (e.g. "m"); omit to take bare numbers as SI
 * @throws InvalidArgumentError naming the argument, the text and what is allowed
 */
export function parseQuantity(
  text: string,
  kind: QuantityKind,
  argument = "quantity",
  defaultUnit?: string,
): Quantity {
  const clean = normalizeUnitText(text);
  const match = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(clean);
  const allowed = `a number with a ${kind === "dimensionless" ? "dimensionless" : kind} unit, e.g. ${EXAMPLE[kind]}`;
  if (match === null) throw new InvalidArgumentError(argument, text, allowed);
  const number = Number(match[1]);
  const written = (match[2] ?? "").trim();
  if (!Number.isFinite(number)) throw new InvalidArgumentError(argument, text, "a finite number");
  const unitText = written === "" ? (defaultUnit ?? "") : written;
  if (unitText === "") return { value: number, unit: SI_UNIT[kind], written };
  const factor = unitFactor(unitText, kind);
  if (factor === undefined) {
    throw new InvalidArgumentError(argument, text, `the unit "${unitText}" is not a ${kind} unit; ${allowed}`);
  }
  return { value: number * factor, unit: SI_UNIT[kind], written };
}

const EXAMPLE: Record<QuantityKind, string> = {
  length: '"532nm", "0.85 m", "5.5 um"',
  angle: '"2 mrad", "0.5 deg"',
  dimensionless: '"0.8"',
};
