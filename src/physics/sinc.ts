/**
 * sinc(β) = sin β / β and its derivative, stable at β → 0 (Taylor series below |β| < 1e-3,
 * truncation error < 1e-19). Shared by every far-field envelope.
 */

/** Scratch result of `sincWithSlope`. */
export interface SincResult {
  /** sin β / β */
  value: number;
  /** d/dβ (sin β / β) = (β cos β − sin β) / β² */
  slope: number;
}

/** sin β / β (dimensionless, β in rad), with sinc(0) = 1. */
export function sinc(beta: number): number {
  if (Math.abs(beta) < 1e-3) {
    const b2 = beta * beta;
    return 1 - (b2 / 6) * (1 - b2 / 20);
  }
  return Math.sin(beta) / beta;
}

/** Writes sinc(β) and its derivative d sinc/dβ (per rad) into `out`, β in rad (one sin and one cos evaluation). */
export function sincWithSlope(beta: number, out: SincResult): void {
  if (Math.abs(beta) < 1e-3) {
    const b2 = beta * beta;
    out.value = 1 - (b2 / 6) * (1 - b2 / 20);
    out.slope = -(beta / 3) * (1 - b2 / 10);
    return;
  }
  const sb = Math.sin(beta);
  out.value = sb / beta;
  out.slope = (beta * Math.cos(beta) - sb) / (beta * beta);
}

/**
 * Writes sinc(β) into `out.value` (β in rad); its slope too when `withSlope`, else slope 0.
 * For loops that need the derivative only when a Jacobian is asked for.
 */
export function sincInto(beta: number, withSlope: boolean, out: SincResult): void {
  if (withSlope) {
    sincWithSlope(beta, out);
  } else {
    out.value = sinc(beta);
    out.slope = 0;
  }
}
