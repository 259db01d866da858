/**
 * The units fringekit reads at its edges, without a general unit library (loading one cost
 * seconds at every start): lengths, angles and the intensity units a detector column may carry,
 * each with its SI factor. Factors: SI prefixes and units (BIPM, The International System of
 * Units, 9th ed., 2019, Tables 7 and 8); inch = 25.4 mm, foot = 0.3048 m, yard = 0.9144 m,
 * mile = 1609.344 m (international yard and pound agreement, 1959); ångström = 10⁻¹⁰ m;
 * degree = π/180 rad, arcminute = degree/60, arcsecond = degree/3600, gradian = π/200 rad.
 */

/** Physical dimension of a unit the tables know. */
export type UnitDimension = "length" | "angle" | "power" | "voltage" | "current" | "energy" | "irradiance";

/** SI prefixes by symbol ("u" and "µ" both micro) and by name. */
const PREFIX_SYMBOL: Record<string, number> = {
  Y: 1e24, Z: 1e21, E: 1e18, P: 1e15, T: 1e12, G: 1e9, M: 1e6, k: 1e3, h: 1e2, da: 1e1,
  d: 1e-1, c: 1e-2, m: 1e-3, u: 1e-6, "µ": 1e-6, n: 1e-9, p: 1e-12, f: 1e-15, a: 1e-18, z: 1e-21, y: 1e-24,
};
const PREFIX_NAME: Record<string, number> = {
  yotta: 1e24, zetta: 1e21, exa: 1e18, peta: 1e15, tera: 1e12, giga: 1e9, mega: 1e6, kilo: 1e3, hecto: 1e2, deca: 1e1,
  deci: 1e-1, centi: 1e-2, milli: 1e-3, micro: 1e-6, nano: 1e-9, pico: 1e-12, femto: 1e-15, atto: 1e-18, zepto: 1e-21, yocto: 1e-24,
};

/** Units that take SI prefixes: symbol or name → dimension and factor to SI. */
const PREFIXABLE_SYMBOL: Record<string, [UnitDimension, number]> = {
  m: ["length", 1], rad: ["angle", 1], W: ["power", 1], V: ["voltage", 1], A: ["current", 1], J: ["energy", 1],
};
const PREFIXABLE_NAME: Record<string, [UnitDimension, number]> = {
  meter: ["length", 1], meters: ["length", 1], metre: ["length", 1], metres: ["length", 1],
  radian: ["angle", 1], radians: ["angle", 1], watt: ["power", 1], watts: ["power", 1],
  volt: ["voltage", 1], volts: ["voltage", 1], ampere: ["current", 1], amperes: ["current", 1], amp: ["current", 1], amps: ["current", 1],
  joule: ["energy", 1], joules: ["energy", 1],
};

/** Units without prefixes. */
const PLAIN: Record<string, [UnitDimension, number]> = {
  in: ["length", 0.0254], inch: ["length", 0.0254], inches: ["length", 0.0254],
  ft: ["length", 0.3048], foot: ["length", 0.3048], feet: ["length", 0.3048],
  yd: ["length", 0.9144], yard: ["length", 0.9144], yards: ["length", 0.9144],
  mi: ["length", 1609.344], mile: ["length", 1609.344], miles: ["length", 1609.344],
  mil: ["length", 2.54e-5], mils: ["length", 2.54e-5],
  angstrom: ["length", 1e-10], angstroms: ["length", 1e-10], "Å": ["length", 1e-10],
  deg: ["angle", Math.PI / 180], "°": ["angle", Math.PI / 180],
  arcmin: ["angle", Math.PI / 10800], arcsec: ["angle", Math.PI / 648000],
  grad: ["angle", Math.PI / 200], cycle: ["angle", 2 * Math.PI], cycles: ["angle", 2 * Math.PI],
};

/**
 * Dimension and SI factor of a single unit word ("mm", "micrometre", "deg", "mW"), or
 * undefined when the tables do not know it. Case matters for symbols (mm ≠ Mm), as in SI.
 */
export function lookupUnit(word: string): { dimension: UnitDimension; factor: number } | undefined {
  const plain = PLAIN[word];
  if (plain) return { dimension: plain[0], factor: plain[1] };
  const direct = PREFIXABLE_SYMBOL[word] ?? PREFIXABLE_NAME[word];
  if (direct) return { dimension: direct[0], factor: direct[1] };
  for (const [prefix, scale] of Object.entries(PREFIX_SYMBOL)) {
    if (word.length > prefix.length && word.startsWith(prefix)) {
      const base = PREFIXABLE_SYMBOL[word.slice(prefix.length)];
      if (base) return { dimension: base[0], factor: base[1] * scale };
    }
  }
  for (const [prefix, scale] of Object.entries(PREFIX_NAME)) {
    if (word.startsWith(prefix)) {
      const base = PREFIXABLE_NAME[word.slice(prefix.length)];
      if (base) return { dimension: base[0], factor: base[1] * scale };
    }
  }
  return undefined;
}

/**
 * Dimension and SI factor of a unit expression: one unit word, or a power unit per area
 * ("W/m^2", "mW/cm2", "uW/mm²") for irradiance; undefined when not readable.
 */
export function lookupUnitExpression(text: string): { dimension: UnitDimension; factor: number } | undefined {
  const clean = text.trim();
  const perArea = /^(\S+?)\s*\/\s*(\S+?)\s*(?:\^\s*2|2|²)$/.exec(clean);
  if (perArea) {
    const top = lookupUnit(perArea[1]!), bottom = lookupUnit(perArea[2]!);
    if (top?.dimension === "power" && bottom?.dimension === "length") return { dimension: "irradiance", factor: top.factor / bottom.factor ** 2 };
    return undefined;
  }
  return lookupUnit(clean);
}
