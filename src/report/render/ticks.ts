/** Automatic axis ticks (1-2-5 steps) and their labels, as plotly chooses them for linear axes. */

/**
 * Tick values inside [low, high] with a 1-2-5 step near (high − low)/target (plotly's rule:
 * about one tick per 80 px on x axes, per 40 px on y axes, 4–9 intervals, unless nticks is given).
 * @param low, high axis range (any unit; high > low)
 * @param target    wanted number of intervals
 */
export function autoTicks(low: number, high: number, target: number): { values: number[]; step: number } {
  const span = high - low;
  if (!(span > 0) || !Number.isFinite(span)) return { values: [low], step: 1 };
  const rough = span / Math.max(1, target);
  const decade = 10 ** Math.floor(Math.log10(rough));
  const mantissa = rough / decade;
  const step = (mantissa <= 1 + 1e-9 ? 1 : mantissa <= 2 + 1e-9 ? 2 : mantissa <= 5 + 1e-9 ? 5 : 10) * decade;
  const values: number[] = [];
  const first = Math.ceil(low / step - 1e-9);
  for (let k = first; k * step <= high + step * 1e-9; k++) values.push(Number((k * step).toPrecision(12)));
  return { values, step };
}

/**
 * Tick label of `value` for ticks `step` apart: as many decimals as the step needs, trailing
 * zeros dropped, and a true minus sign (U+2212) as in typeset figures.
 */
export function tickLabel(value: number, step?: number): string {
  let text: string;
  if (step !== undefined && step > 0) {
    const decimals = Math.max(0, Math.min(12, Math.ceil(-Math.log10(step) - 1e-9)));
    text = value.toFixed(decimals);
    if (text.includes(".")) text = text.replace(/0+$/, "").replace(/\.$/, "");
  } else {
    text = String(Number(value.toPrecision(10)));
  }
  if (/^-0(\.0*)?$/.test(text)) text = "0";
  return text.replace("-", "−");
}
