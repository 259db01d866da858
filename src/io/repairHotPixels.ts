/** Isolated hot pixels: found against their four neighbours and replaced by their mean. */

/** Hot pixel: more than this many robust noise σ above the largest of its four neighbours. */
export const HOT_PIXEL_THRESHOLD = 12;

/** Replaces isolated hot pixels; returns where they were. The noise scale is the median absolute
 * difference between vertical neighbours, i.e. along the fringes, where the pattern hardly
 * changes (×1.4826/√2 turns it into a Gaussian σ); at least half a code step.
 * @param values row-major pixels (modified in place)
 * @param w      pixels per row
 * @param h      rows
 * @param flags  non-zero for pixels to leave alone (saturated, bad flat)
 * @returns the repaired pixels as [column, row] within the region (0-based) */
export function repairHotPixels(values: Float32Array, w: number, h: number, flags: Uint8Array): [number, number][] {
  const repaired: [number, number][] = [];
  if (w < 3 || h < 3) return repaired;
  const sample: number[] = [];
  const step = Math.max(1, Math.floor((w * (h - 1)) / 20000));
  for (let i = 0; i + w < values.length; i += step) sample.push(Math.abs((values[i + w] as number) - (values[i] as number)));
  sample.sort((a, b) => a - b);
  const noise = Math.max((sample[Math.floor(sample.length / 2)] ?? 0) * 1.4826 / Math.SQRT2, 0.5);
  const threshold = HOT_PIXEL_THRESHOLD * noise;
  for (let r = 1; r < h - 1; r++) {
    for (let c = 1; c < w - 1; c++) {
      const i = r * w + c;
      if (flags[i] !== 0) continue;
      const a = values[i - 1] as number, b = values[i + 1] as number, u = values[i - w] as number, d = values[i + w] as number;
      if ((values[i] as number) - Math.max(a, b, u, d) > threshold) {
        values[i] = (a + b + u + d) / 4;
        repaired.push([c, r]);
      }
    }
  }
  return repaired;
}
