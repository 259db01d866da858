/** Axis titles with units in the usual "quantity symbol (unit)" form, and unit scaling of positions. */
import { choosePrefix } from "../siPrefix.js";
import { plotlyText } from "./figureSpec.js";

/** Scale and label for positions given in m: the SI prefix that suits the largest |x|. */
export function lengthAxis(values: ArrayLike<number>, quantity: string, symbol: string): { scale: number; title: string; unit: string } {
  let largest = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) largest = Math.max(largest, Math.abs(values[i]));
  const prefix = choosePrefix(largest);
  const unit = `${prefix.symbol}m`;
  return { scale: 10 ** -prefix.exponent, unit, title: `${quantity} <i>${symbol}</i> (${unit})` };
}

/**
 * Scale and title of an intensity axis. Counts above 10⁴ are shown in 10³ counts, so tick
 * labels stay short numbers ("20", not "20k" or "20000"); the unit is the profile's (user text, escaped).
 */
export function intensityAxis(values: ArrayLike<number>, yUnit: string): { scale: number; title: string } {
  let largest = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) largest = Math.max(largest, Math.abs(values[i]));
  const power = largest >= 1e4 ? 3 * Math.floor(Math.log10(largest) / 3) : 0;
  const factor = power === 0 ? "" : `10<sup>${power}</sup> `;
  const unit = yUnit ? plotlyText(yUnit) : "";
  const inner = `${factor}${unit}`.trim();
  return { scale: 10 ** -power, title: inner ? `Intensity <i>I</i> (${inner})` : "Intensity <i>I</i>" };
}
