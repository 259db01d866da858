/**
 * Fringe tilt from the gradient structure tensor: fringes vary along one direction n, so the
 * intensity gradient points along ±n everywhere; the dominant orientation of the summed
 * tensor [Σgx², Σgxgy; Σgxgy, Σgy²] gives n. Method: Bigün & Granlund (1987), "Optimal
 * orientation detection of linear symmetry", Proc. 1st ICCV, 433–438.
 */

/**
 * Angle (rad) of the fringe normal from the image x axis (rows), y pointing down the rows;
 * 0 for fringes that vary along x only. Pixels with `skip[i] = 1` and their neighbours are left out.
 * @param pixels row-major values, width × height
 * @param width  pixels per row
 * @param height rows
 * @param skip   optional flags of pixels to leave out (saturated, hot)
 */
export function measureTilt(pixels: ArrayLike<number>, width: number, height: number, skip?: Uint8Array): number {
  let jxx = 0, jyy = 0, jxy = 0;
  for (let r = 1; r < height - 1; r++) {
    const row = r * width;
    for (let c = 1; c < width - 1; c++) {
      const i = row + c;
      if (skip && (skip[i - 1] || skip[i + 1] || skip[i - width] || skip[i + width])) continue;
      const gx = (pixels[i + 1] as number) - (pixels[i - 1] as number);
      const gy = (pixels[i + width] as number) - (pixels[i - width] as number);
      jxx += gx * gx;
      jyy += gy * gy;
      jxy += gx * gy;
    }
  }
  let angle = 0.5 * Math.atan2(2 * jxy, jxx - jyy);
  // The normal is defined up to sign; keep it within ±45° of the x axis (fringes along y).
  if (angle > Math.PI / 4) angle -= Math.PI / 2;
  if (angle < -Math.PI / 4) angle += Math.PI / 2;
  return angle;
}
