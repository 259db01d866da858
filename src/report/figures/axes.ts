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

/** Title of an intensity axis; the unit is the profile's (user text, escaped). */
export function intensityTitle(yUnit: string): string {
  return yUnit ? `Intensity <i>I</i> (${plotlyText(yUnit)})` : "Intensity <i>I</i>";
}
