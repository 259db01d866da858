/**
 * Display units at the widget edge: SI values inside, readable prefixes on screen
 * (a wavelength in nm, a slit width in µm or mm). One scale per parameter, chosen once.
 */
import { formatQuantity } from "../../src/report/formatQuantity.js";

/** A display unit: shown label and the factor from SI (display = SI × factor). */
export interface DisplayUnit {
  label: string;
  factor: number;
}

const lengthUnits: DisplayUnit[] = [
  { label: "nm", factor: 1e9 },
  { label: "µm", factor: 1e6 },
  { label: "mm", factor: 1e3 },
  { label: "m", factor: 1 },
];

/**
 * Pick the display unit for a value of SI unit `unit` with typical magnitude `typical` (SI).
 * Lengths get the largest prefix that shows the value as ≥ 1 (nm, µm, mm, m); other units as is.
 */
export function displayUnitFor(unit: string, typical: number): DisplayUnit {
  if (unit === "m") {
    const magnitude = Math.abs(typical);
    if (!(magnitude > 0) || !Number.isFinite(magnitude)) return { label: "µm", factor: 1e6 };
    for (let i = lengthUnits.length - 1; i >= 0; i--) {
      if (magnitude * lengthUnits[i]!.factor >= 1 || i === 0) return lengthUnits[i]!;
    }
  }
  if (unit === "1") return { label: "", factor: 1 };
  return { label: unit, factor: 1 };
}

/** Format a number with `digits` significant digits, without exponent for everyday magnitudes. */
export function formatNumber(value: number, digits = 5): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e6) return Number(value.toPrecision(digits)).toString();
  return value.toExponential(digits - 1);
}

/**
 * "value ± uncertainty" with the uncertainty rounded to two significant digits and the value
 * to the same decimal place: the library's formatter (formatQuantity, GUM 7.2.6) on numbers
 * already in a display unit; exponent notation beyond its readable range.
 */
export function formatWithUncertainty(value: number, uncertainty: number): string {
  if (!(uncertainty > 0) || !Number.isFinite(uncertainty) || !Number.isFinite(value)) {
    return uncertainty === Infinity ? `${formatNumber(value)} ± ∞` : formatNumber(value);
  }
  if (uncertainty < 1e-8 * Math.max(1, Math.abs(value)) || Math.abs(value) >= 1e7 || uncertainty < 1e-8) {
    return `${value.toExponential(3)} ± ${uncertainty.toExponential(1)}`;
  }
  return formatQuantity(value, uncertainty, "1", { prefix: "none" }).text;
}
