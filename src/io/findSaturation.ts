/**
 * Saturation: a detector clips at its top code (2^bits − 1: 255, 1023, 4095, 16383, 65535).
 * Samples sitting exactly at that code carry no information about the true intensity.
 */

/** Top codes of common detector bit depths (8, 10, 12, 14, 16 bits). */
export const TOP_CODES = [255, 1023, 4095, 16383, 65535] as const;

/**
 * The top code reached by the data, when at least `minCount` samples sit exactly on
 * the largest value and that value is a detector top code; otherwise undefined.
 * @param values   intensities (counts)
 * @param minCount how many samples at the maximum make a plateau (default 2)
 * @param topCode  the detector's top code (counts) when known (e.g. 4095 from a 12-bit depth)
 */
export function findSaturationCode(values: ArrayLike<number>, minCount = 2, topCode?: number): number | undefined {
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) if ((values[i] as number) > max) max = values[i] as number;
  const candidates: readonly number[] = topCode !== undefined ? [topCode, ...TOP_CODES] : TOP_CODES;
  if (!candidates.includes(max)) return undefined;
  let count = 0;
  for (let i = 0; i < values.length; i++) if (values[i] === max) count++;
  return count >= minCount ? max : undefined;
}

/**
 * Contiguous index ranges [start, end] (inclusive) where `flag` is set, for messages.
 * @param flag 1 where the condition holds
 */
export function flaggedRanges(flag: ArrayLike<number>): [number, number][] {
  const ranges: [number, number][] = [];
  let start = -1;
  for (let i = 0; i <= flag.length; i++) {
    const on = i < flag.length && flag[i] === 1;
    if (on && start < 0) start = i;
    if (!on && start >= 0) {
      ranges.push([start, i - 1]);
      start = -1;
    }
  }
  return ranges;
}
