/**
 * Column headers with units: "position [mm]", "intensity (counts)", "x/um", "sigma [a.u.]".
 */
import { normalizeUnitText, unitFactor } from "./parseQuantity.js";
import { lookupUnitExpression, type UnitDimension } from "./unitTable.js";

/** A column header split into its name and unit. */
export interface ColumnHeader {
  /** Name without the unit, trimmed and lower-cased ("position"). */
  name: string;
  /** Unit text as written inside the brackets, "" when none ("mm"). */
  unit: string;
  /** Header text as read. */
  raw: string;
}

/**
 * Splits "NAME [UNIT]", "NAME (UNIT)", "NAME / UNIT" or "NAME in UNIT" into name and unit.
 * @param raw header cell text
 */
export function parseColumnHeader(raw: string): ColumnHeader {
  const text = raw.trim().replace(/^["']|["']$/g, "");
  const bracket = /^(.*?)\s*[[(]\s*([^\])]*?)\s*[\])]\s*$/.exec(text);
  if (bracket) return { name: (bracket[1] ?? "").trim().toLowerCase(), unit: bracket[2] ?? "", raw };
  const slash = /^(.*?[A-Za-z_].*?)\s*\/\s*([^/]+)$/.exec(text);
  if (slash) return { name: (slash[1] ?? "").trim().toLowerCase(), unit: (slash[2] ?? "").trim(), raw };
  return { name: text.toLowerCase(), unit: "", raw };
}

/** Unit words meaning "detector pixel index". */
const PIXEL_UNITS = new Set(["px", "pixel", "pixels", "pix", "index"]);

/** Unit words for detector counts (integers, Poisson noise applies). */
const COUNT_UNITS = new Set(["counts", "count", "cts", "adu", "dn", "photons", "electrons", "e-"]);

/** Unit words for relative intensities. */
const RELATIVE_UNITS = new Set(["a.u.", "au", "arb", "arb.", "arb. u.", "arb. units", "arbitrary units", "rel", "rel.", "norm", "normalized", "normalised", "%", "1", ""]);

/** True when the unit text means a pixel index. */
export function isPixelUnit(unitText: string): boolean {
  return PIXEL_UNITS.has(unitText.trim().toLowerCase());
}

/** True when the unit text means integer detector counts. */
export function isCountUnit(unitText: string): boolean {
  return COUNT_UNITS.has(unitText.trim().toLowerCase());
}

/**
 * Metres per unit of a position column, or undefined when the unit is not a length.
 * @param unitText unit inside the header brackets ("mm" → 0.001)
 */
export function positionUnitFactor(unitText: string): number | undefined {
  return unitFactor(unitText, "length");
}

/**
 * Whether a unit may label an intensity column: counts, relative units, or a unit of
 * power, voltage, current, energy or irradiance. Lengths, masses, times are refused.
 * @param unitText unit inside the header brackets
 */
export function isIntensityUnit(unitText: string): boolean {
  const text = unitText.trim().toLowerCase();
  if (COUNT_UNITS.has(text) || RELATIVE_UNITS.has(text)) return true;
  const known = lookupUnitExpression(normalizeUnitText(unitText));
  return known !== undefined && INTENSITY_DIMENSIONS.has(known.dimension);
}

const INTENSITY_DIMENSIONS = new Set<UnitDimension>(["power", "voltage", "current", "energy", "irradiance"]);
