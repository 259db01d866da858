/**
 * Parsing of physical quantities typed by people ("532nm", "532 nm", "0.85m", "5.5 µm")
 * into SI numbers, with mathjs units.
 */
import { unit as mathUnit, type Unit } from "mathjs";
import { InvalidArgumentError } from "../errors.js";

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
 * Rewrites the micro signs (U+00B5, U+03BC) and "micron" that mathjs does not read into "u".
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
 * Parses a mathjs unit expression without a number ("mm", "nm", "mrad") and returns the factor
 * that converts a value in it to SI, or undefined when it is not a unit mathjs knows.
 * @param text unit text, e.g. "mm" → 0.001 (metres per millimetre)
 * @param kind the physical kind the unit must have
 */
export function unitFactor(text: string, kind: QuantityKind): number | undefined {
  const clean = normalizeUnitText(text);
  if (clean === "" || clean === "1") return kind === "dimensionless" ? 1 : undefined;
  let parsed: Unit;
  try {
    parsed = mathUnit(1, clean);
  } catch {
    return undefined;
  }
  if (!hasKind(parsed, kind)) return undefined;
  return parsed.toNumber(SI_UNIT[kind] === "1" ? "" : SI_UNIT[kind]);
}

/** True when the unit's dimension matches the kind (mathjs compares base dimensions). */
export function hasKind(parsed: Unit, kind: QuantityKind): boolean {
  if (kind === "dimensionless") return parsed.dimensions.every((d) => d === 0);
  return parsed.equalBase(mathUnit(SI_UNIT[kind]));
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
