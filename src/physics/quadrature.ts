/**
 * Gaussian quadrature rules used for pixel averaging, detector blur and spectral averages.
 * Nodes are found by Newton's method on the three-term recurrences
 * (Abramowitz & Stegun 22.7.10 for Legendre, 22.7.13 for Hermite), accurate to ~1e-15.
 */
import { InvalidArgumentError } from "../errors.js";

/** A quadrature rule: ∫ f ≈ Σ weights[k] · f(nodes[k]). */
export interface QuadratureRule {
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

/**
 * n-point Gauss–Legendre rule on [−1, 1] (weight 1), exact for polynomials of degree ≤ 2n − 1
 * (Abramowitz & Stegun 25.4.29).
 * @param n number of nodes, integer 1…200
 */
export function gaussLegendre(n: number): QuadratureRule {
  checkCount(n);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  const half = Math.floor((n + 1) / 2);
  for (let i = 0; i < half; i++) {
    // Chebyshev-like first guess, then Newton on P_n
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) p0 = 1;
      const pn = n === 1 ? x : p1;
      derivative = (n * (x * pn - p0)) / (x * x - 1);
      const step = pn / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    if (n === 1) derivative = 1;
    const weight = 2 / ((1 - x * x) * derivative * derivative);
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    weights[i] = weight;
    weights[n - 1 - i] = weight;
  }
  if (n % 2 === 1) nodes[(n - 1) / 2] = 0;
  return { nodes, weights };
}

/**
 * n-point Gauss–Hermite rule for ∫ exp(−t²) f(t) dt over the real line
 * (Abramowitz & Stegun 25.4.46), exact for polynomials of degree ≤ 2n − 1.
 * @param n number of nodes, integer 1…200
 */
export function gaussHermite(n: number): QuadratureRule {
  checkCount(n);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  const piQuarter = Math.pow(Math.PI, -0.25);
  const half = Math.floor((n + 1) / 2);
  let z = 0;
  for (let i = 0; i < half; i++) {
    // initial guesses for the largest roots first (asymptotic spacing of Hermite zeros)
    if (i === 0) z = Math.sqrt(2 * n + 1) - 1.85575 * Math.pow(2 * n + 1, -1 / 6);
    else if (i === 1) z -= (1.14 * Math.pow(n, 0.426)) / z;
    else if (i === 2) z = 1.86 * z - 0.86 * nodes[n - 1]!;
    else if (i === 3) z = 1.91 * z - 0.91 * nodes[n - 2]!;
    else z = 2 * z - nodes[n - i + 1]!;
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      // orthonormal Hermite functions: h_k = sqrt(2/k) t h_{k−1} − sqrt((k−1)/k) h_{k−2}
      let p1 = piQuarter;
      let p2 = 0;
      for (let k = 1; k <= n; k++) {
        const p3 = p2;
        p2 = p1;
        p1 = z * Math.sqrt(2 / k) * p2 - Math.sqrt((k - 1) / k) * p3;
      }
      derivative = Math.sqrt(2 * n) * p2;
      const step = p1 / derivative;
      z -= step;
      if (Math.abs(step) < 1e-15 * Math.max(1, Math.abs(z))) break;
    }
    nodes[n - 1 - i] = z;
    nodes[i] = -z;
    const weight = 2 / (derivative * derivative);
    weights[n - 1 - i] = weight;
    weights[i] = weight;
  }
  if (n % 2 === 1) nodes[(n - 1) / 2] = 0;
  return { nodes, weights };
}

function checkCount(n: number): void {
  if (!Number.isInteger(n) || n < 1 || n > 200) {
    throw new InvalidArgumentError("quadrature node count", n, "an integer from 1 to 200");
  }
}
