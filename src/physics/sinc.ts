/**
 * sinc(β) = sin β / β and its derivative, stable at β → 0 (Taylor series below |β| < 1e-3,
 * truncation error < 1e-19).
 */

/** sin β / β (dimensionless), with sinc(0) = 1. */
export function sinc(beta: number): number {
  if (Math.abs(beta) < 1e-3) {
    const b2 = beta * beta;
    return 1 - (b2 / 6) * (1 - b2 / 20);
  }
  return Math.sin(beta) / beta;
}

/** d/dβ (sin β / β) = (β cos β − sin β) / β². */
export function sincDerivative(beta: number): number {
  if (Math.abs(beta) < 1e-3) {
    const b2 = beta * beta;
    return -(beta / 3) * (1 - b2 / 10);
  }
  return (beta * Math.cos(beta) - Math.sin(beta)) / (beta * beta);
}
