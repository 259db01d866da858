/**
 * Direction sine of a detector point seen from the slits, and its derivatives.
 * Exact: s = sin θ = u / √(u² + L²); small-angle: s = u / L (u = x − center, L = distance).
 */

/** Scratch result of `directionSine`: s and its partial derivatives (per m). */
export interface SineResult {
  s: number;
  /** ∂s/∂u */
  dsdu: number;
  /** ∂s/∂L */
  dsdL: number;
}

/**
 * Writes sin θ for offset u (m) from the axis at screen distance L (m) into `out`.
 * @param smallAngle use s = u/L instead of the exact form
 */
export function directionSine(u: number, distance: number, smallAngle: boolean, out: SineResult): void {
  if (smallAngle) {
    out.s = u / distance;
    out.dsdu = 1 / distance;
    out.dsdL = -u / (distance * distance);
    return;
  }
  const r2 = u * u + distance * distance;
  const r = Math.sqrt(r2);
  const inv3 = 1 / (r2 * r);
  out.s = u / r;
  out.dsdu = distance * distance * inv3;
  out.dsdL = -u * distance * inv3;
}
