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
  const unit = yUnit ? plotlyText(unitInTitle(yUnit)) : "";
  const inner = `${factor}${unit}`.trim();
  return { scale: 10 ** -power, title: inner ? `Intensity <i>I</i> (${inner})` : "Intensity <i>I</i>" };
}

/**
 * A unit as it reads inside an axis title's brackets: a trailing note in brackets becomes a
 * comma clause ("counts (row mean)" → "counts, row mean"; "V [rms]" → "V, rms"), and a unit
 * wholly in brackets loses them ("(a.u.)" → "a.u."), so the title never shows nested brackets.
 * @param unit unit text as the user gave it (plain text, not yet escaped)
 */
export function unitInTitle(unit: string): string {
  let text = unit.trim();
  const whole = /^[([]\s*([^()[\]]*?)\s*[)\]]$/.exec(text);
  if (whole) return whole[1]!;
  for (;;) {
    const note = /^(.*?[^\s,])\s*[([]\s*([^()[\]]*?)\s*[)\]]$/.exec(text);
    if (!note || !note[2]) return text;
    text = `${note[1]}, ${note[2]}`;
  }
}

/**
 * Tick values of a symmetric axis −limit…limit (e.g. normalised residuals, in σ): 0 and ±k·step
 * for k = 1…n with a 1-2-5 step no larger than limit, so there are always at least three ticks
 * (−step, 0, step), each inside the range. The step is the smallest that keeps n ≤
 * (maxTicks − 1)/2; when the 1-2-5 series has no such step up to limit, the largest step up
 * to limit (then n may reach 2 (maxTicks − 1)/2).
 * @param limit    half-range of the axis (> 0, same unit as the ticks)
 * @param maxTicks ticks wanted at most (3 or 4 aims at three, 5 or 6 at five, ...)
 */
export function symmetricTicks(limit: number, maxTicks = 5): number[] {
  if (!(limit > 0) || !Number.isFinite(limit)) return [-1, 0, 1];
  const perSide = Math.max(1, Math.floor((maxTicks - 1) / 2));
  const top = limit * (1 + 1e-9);
  const decade = Math.floor(Math.log10(limit));
  const steps: number[] = [];
  for (let e = decade - 2; e <= decade; e++) for (const m of [1, 2, 5]) if (m * 10 ** e <= top) steps.push(m * 10 ** e);
  const step = steps.find((s) => Math.floor(top / s) <= perSide) ?? steps[steps.length - 1]!;
  const n = Math.floor(top / step);
  const ticks: number[] = [];
  for (let k = -n; k <= n; k++) ticks.push(Number((k * step).toPrecision(12)));
  return ticks;
}
