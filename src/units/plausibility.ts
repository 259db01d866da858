/**
 * Plausibility of lengths given in metres: a wavelength of 532 m or a pixel of 3.45 m is a
 * number typed without its unit. Such values are refused, naming the unit the number looks
 * like it was meant in. The ranges are wide on purpose (common practice for optical benches):
 * only values no optical interference measurement can have are refused.
 */
import { InvalidArgumentError } from "../errors.js";

/** Plausible range (m) and a typical value (m) of a length, with a name for messages. */
interface LengthRange {
  what: string;
  lower: number;
  upper: number;
  typical: number;
}

/** Ranges by project-wide parameter name (m). Names not listed are not checked. */
const RANGES: Record<string, LengthRange> = {
  wavelength: { what: "wavelength", lower: 1e-11, upper: 1e-3, typical: 600e-9 },
  bandwidth: { what: "bandwidth (FWHM)", lower: 0, upper: 1e-4, typical: 10e-9 },
  distance: { what: "slit–detector distance", lower: 1e-4, upper: 100, typical: 1 },
  separation: { what: "slit separation", lower: 1e-7, upper: 0.1, typical: 0.5e-3 },
  width: { what: "slit width", lower: 1e-8, upper: 0.1, typical: 0.1e-3 },
  pixelWidth: { what: "pixel width", lower: 0, upper: 1e-2, typical: 5e-6 },
  pixelPitch: { what: "pixel pitch", lower: 1e-7, upper: 1e-2, typical: 5e-6 },
  beamWaist: { what: "beam waist", lower: 1e-7, upper: 1, typical: 2e-3 },
  blur: { what: "blur", lower: 0, upper: 0.1, typical: 10e-6 },
  sourceDistance: { what: "source distance", lower: 1e-4, upper: Infinity, typical: 1 },
};

/** Unit words and their size in metres, candidates for "the unit you meant". */
const UNITS: [string, string, number][] = [
  ["nanometres", "nm", 1e-9],
  ["micrometres", "um", 1e-6],
  ["millimetres", "mm", 1e-3],
  ["centimetres", "cm", 1e-2],
  ["metres", "m", 1],
  ["kilometres", "km", 1e3],
];

/**
 * Refuses a length (m) outside the plausible range of the named quantity, suggesting the unit
 * the number most likely meant (the one that brings it nearest the typical value, in log scale).
 * Zero passes where it switches an effect off (pixelWidth, blur, bandwidth).
 * @param name     parameter name (wavelength, distance, separation, width, pixelWidth, pixelPitch, …)
 * @param value    the value in metres
 * @param argument what to call it in the message (e.g. "fix.wavelength")
 * @param written  the number as the user wrote it (default: value)
 * @throws InvalidArgumentError e.g. 'invalid fix.wavelength: 532 (532 m is not a plausible wavelength; 532 looks like nanometres: write "532 nm")'
 */
export function checkPlausibleLength(name: string, value: number, argument: string, written: number = value): void {
  const range = Object.hasOwn(RANGES, name) ? RANGES[name] : undefined;
  if (!range || !Number.isFinite(value)) return;
  if (value <= 0) return; // sign and zero are the bounds' business (0 switches some effects off)
  if (value >= range.lower && value <= range.upper) return;
  let best: [string, string, number] | undefined;
  let bestDistance = Infinity;
  for (const unit of UNITS) {
    const candidate = written * unit[2];
    if (!(candidate > 0) || candidate < range.lower || candidate > range.upper) continue;
    const distance = Math.abs(Math.log(candidate / range.typical));
    if (distance < bestDistance) { bestDistance = distance; best = unit; }
  }
  const here = `${value} m is not a plausible ${range.what} (expected ${rangeText(range)})`;
  const hint = best ? `; ${written} looks like ${best[0]}: write "${written} ${best[1]}"` : "; give the value with its unit, e.g. \"532 nm\"";
  throw new InvalidArgumentError(argument, written, here + hint);
}

/** "10 pm to 1 mm". */
function rangeText(range: LengthRange): string {
  const show = (v: number): string => {
    if (v === Infinity) return "any size";
    if (v === 0) return "0";
    for (const [, symbol, size] of [...UNITS].reverse()) if (v >= size) return `${Number((v / size).toPrecision(3))} ${symbol}`;
    return `${v} m`;
  };
  return `${show(range.lower)} to ${show(range.upper)}`;
}
