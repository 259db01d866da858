/**
 * sin x and cos x together, with one argument reduction: the hot loops of the far-field models
 * need both at every quadrature node, and two separate Math.sin/Math.cos calls reduce the
 * argument twice. Accuracy: absolute error ≤ 2.5e-16 (about 1 ulp of values near 1) for
 * |x| < 2^19, checked against mpmath in test/physics/sincos.test.ts; larger or non-finite x
 * use Math.sin/cos.
 *
 * Method: x = n·π/2 + r with π/2 split into a 33-bit head and its tail (Cody & Waite, Software
 * Manual for the Elementary Functions, 1980, ch. 8), so n·head is exact for |n| < 2^20; then the
 * minimax polynomials of fdlibm's k_sin.c / k_cos.c (Sun Microsystems, 1993; coefficients from
 * memory, verified by the test) on |r| ≤ π/4, and the quadrant n mod 4 picks signs and order.
 */

const INV_PIO2 = 6.36619772367581382433e-1;
const PIO2_HEAD = 1.57079632673412561417e+0; // first 33 bits of π/2
const PIO2_TAIL = 6.07710050650619224932e-11; // π/2 − PIO2_HEAD
const S1 = -1.66666666666666324348e-1, S2 = 8.33333333332248946124e-3, S3 = -1.98412698298579493134e-4;
const S4 = 2.75573137070700676789e-6, S5 = -2.50507602534068634195e-8, S6 = 1.58969099521155010221e-10;
const C1 = 4.16666666666666019037e-2, C2 = -1.38888888888741095749e-3, C3 = 2.48015872894767294178e-5;
const C4 = -2.75573143513906633035e-7, C5 = 2.08757232129817482790e-9, C6 = -1.13596475577881948265e-11;
const LIMIT = 524288; // 2^19

/**
 * sines[t] = sin angles[t] and cosines[t] = cos angles[t] for t < count (angles in rad).
 * A bulk call, so the loop body is optimised once instead of being inlined at each call site.
 * @example sinCosInto(gammas, n, sinGamma, cosGamma);
 */
export function sinCosInto(angles: Float64Array, count: number, sines: Float64Array, cosines: Float64Array): void {
  for (let t = 0; t < count; t++) {
    const x = angles[t]!;
    if (!(Math.abs(x) < LIMIT)) {
      sines[t] = Math.sin(x);
      cosines[t] = Math.cos(x);
      continue;
    }
    const n = Math.round(x * INV_PIO2);
    const r = (x - n * PIO2_HEAD) - n * PIO2_TAIL;
    const z = r * r, w = z * z;
    const sinR = r + z * r * (S1 + z * (S2 + z * (S3 + z * S4) + z * w * (S5 + z * S6)));
    const half = 0.5 * z, head = 1 - half;
    const cosR = head + (((1 - head) - half) + z * (z * (C1 + z * (C2 + z * C3)) + w * w * (C4 + z * (C5 + z * C6))));
    const quadrant = n & 3;
    sines[t] = quadrant === 0 ? sinR : quadrant === 1 ? cosR : quadrant === 2 ? -sinR : -cosR;
    cosines[t] = quadrant === 0 ? cosR : quadrant === 1 ? -sinR : quadrant === 2 ? -cosR : sinR;
  }
}
