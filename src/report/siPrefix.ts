/**
 * SI prefixes chosen for readability (SI Brochure, 9th ed. 2019, section 3): engineering
 * steps of 10³ so the printed number falls in [1, 1000).
 */

/** One SI prefix: its symbol (µ is U+00B5 MICRO SIGN) and power of ten. */
export interface SiPrefix {
  symbol: string;
  exponent: number;
}

/** Prefixes from pico to giga, the range that occurs in fringe work (SI Brochure 2019, Table 7). */
export const SI_PREFIXES: readonly SiPrefix[] = [
  { symbol: "p", exponent: -12 },
  { symbol: "n", exponent: -9 },
  { symbol: "µ", exponent: -6 },
  { symbol: "m", exponent: -3 },
  { symbol: "", exponent: 0 },
  { symbol: "k", exponent: 3 },
  { symbol: "M", exponent: 6 },
  { symbol: "G", exponent: 9 },
];

/**
 * Units that take a prefix. Angles in rad, counts and dimensionless numbers keep their unit
 * as it is: "0.30 rad" and "20 000 counts" read better than "300 mrad" or "20 kcounts".
 */
const PREFIXABLE = new Set(["m", "s", "Hz", "W", "J", "V", "A", "N", "Pa", "g", "K"]);

/** True when `unit` (an SI symbol such as "m") may carry an SI prefix. */
export function takesPrefix(unit: string): boolean {
  return PREFIXABLE.has(unit);
}

/**
 * The prefix that puts `magnitude` (in the unprefixed unit) in [1, 1000), clamped to p…G.
 * Zero and non-finite magnitudes get no prefix.
 * Example: choosePrefix(6.328e-7) → { symbol: "n", exponent: -9 } (632.8 nm).
 * @param magnitude size of the number to print, in the base unit (e.g. m)
 */
export function choosePrefix(magnitude: number): SiPrefix {
  const size = Math.abs(magnitude);
  if (!Number.isFinite(size) || size === 0) return SI_PREFIXES[4];
  // Decide on the number as it will print (3 significant digits), so 999.96e-9 becomes 1.00 µm.
  const exponent = Number(size.toExponential(2).split("e")[1]);
  const step = Math.floor(exponent / 3) * 3;
  const clamped = Math.min(9, Math.max(-12, step));
  return SI_PREFIXES.find((prefix) => prefix.exponent === clamped) ?? SI_PREFIXES[4];
}

/** Look up a prefix by its symbol ("u" is accepted for µ). Returns undefined when unknown. */
export function prefixBySymbol(symbol: string): SiPrefix | undefined {
  const wanted = symbol === "u" || symbol === "\u03bc" ? "µ" : symbol;
  return SI_PREFIXES.find((prefix) => prefix.symbol === wanted);
}
