/**
 * Detector effects for any point pattern: averaging over each pixel's width
 * (Gauss–Legendre), Gaussian blur (Gauss–Hermite) and a constant + linear background.
 *
 * Measured intensity at pixel centre x:
 *   I(x) = background + backgroundSlope · x
 *        + (1/w) ∫_{−w/2}^{w/2} ∫ g_σ(t) P(x + ξ + t) dt dξ,
 * w = pixelWidth, g_σ a unit-area Gaussian of standard deviation σ = blur, P the pattern.
 * Derivatives follow by differentiating under the integral (∂/∂w and ∂/∂σ use ∂P/∂x).
 * With blur = 0 the blur nodes are skipped (the σ-derivative is then exactly 0 by symmetry).
 * Accuracy on a cosine fringe of period P (test/physics/detector.test.ts): 5 Legendre nodes
 * err by ~3e-11 of the fringe amplitude at w = P/4 (far less at usual pixel sizes);
 * 16 Hermite nodes by < 1e-9 up to σ = P/4.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model, ParameterSpec } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { gaussHermite, gaussLegendre } from "./quadrature.js";

/** Options of the detector stage. */
export interface DetectorOptions {
  /** Gauss–Legendre nodes across one pixel (default 5; 1 = sample at the pixel centre). */
  pixelNodes?: number;
  /** Gauss–Hermite nodes for the blur integral when blur > 0 (default 16). Enough while
   * blur is below about half a fringe period; more nodes for stronger blur. */
  blurNodes?: number;
}

/** Parameters the detector stage appends after the pattern's own, in this order. */
export const DETECTOR_PARAMETERS: readonly ParameterSpec[] = [
  { name: "background", unit: "counts", default: 0, lower: -Infinity, upper: Infinity,
    description: "Constant background added to every pixel." },
  { name: "backgroundSlope", unit: "counts/m", default: 0, lower: -Infinity, upper: Infinity,
    description: "Linear background: added intensity per metre of detector position x.", fixedByDefault: true },
  { name: "pixelWidth", unit: "m", default: 0, lower: 0, upper: Infinity,
    description: "Width over which each pixel averages the pattern (usually the pixel pitch); 0 samples at the centre.", fixedByDefault: true },
  { name: "blur", unit: "m", default: 0, lower: 0, upper: Infinity,
    description: "Standard deviation of a Gaussian detector blur; 0 for none.", fixedByDefault: true },
];

/**
 * Wraps a point pattern into a Model with detector effects (see module comment).
 * Parameters: the pattern's, then background (counts), backgroundSlope (counts/m),
 * pixelWidth (m), blur (m). Positions x in m.
 * Cost per pixel: pixelNodes pattern evaluations (× blurNodes when blur > 0).
 * @example const model = detectorModel(twoSlitPattern(), { pixelNodes: 5 });
 */
export function detectorModel(pattern: PointPattern, options: DetectorOptions = {}): Model {
  const pixelNodes = options.pixelNodes ?? 5;
  const blurNodes = options.blurNodes ?? 16;
  if (!Number.isInteger(pixelNodes) || pixelNodes < 1 || pixelNodes > 64) {
    throw new InvalidArgumentError("pixelNodes", pixelNodes, "an integer from 1 to 64");
  }
  if (!Number.isInteger(blurNodes) || blurNodes < 2 || blurNodes > 64) {
    throw new InvalidArgumentError("blurNodes", blurNodes, "an integer from 2 to 64");
  }
  const np = pattern.parameters.length;
  const parameters = [...pattern.parameters, ...DETECTOR_PARAMETERS];
  const p = parameters.length;
  const iBackground = np;
  const iSlope = np + 1;
  const iPixel = np + 2;
  const iBlur = np + 3;

  const legendre = gaussLegendre(pixelNodes);
  // half-offsets h_k/2 and weights w_k/2 so that Σ weights = 1
  const pixelOffsets = legendre.nodes.map((node) => node / 2);
  const pixelWeights = legendre.weights.map((weight) => weight / 2);
  const hermite = gaussHermite(blurNodes);
  const blurOffsets = hermite.nodes.map((node) => Math.SQRT2 * node);
  const blurWeights = hermite.weights.map((weight) => weight / Math.sqrt(Math.PI));

  const singleOffset = new Float64Array([0]);
  const singleWeight = new Float64Array([1]);
  const stride = np + 1;
  const one = new Float64Array(stride);
  // Quadrature nodes are evaluated in blocks of whole pixels through the pattern's bulk methods
  // (or a per-node loop for patterns without them): scratch sized for ~1024 nodes, made once.
  const nodesPerPixel = pixelNodes * blurNodes;
  const blockPixels = Math.max(1, Math.floor(1024 / nodesPerPixel));
  const blockNodes = blockPixels * nodesPerPixel;
  const positions = new Float64Array(blockNodes);
  const values = new Float64Array(blockNodes);
  const grads = new Float64Array(blockNodes * stride);
  const valuesAt = pattern.valuesAt?.bind(pattern)
    ?? ((at: Float64Array, count: number, into: Float64Array): void => {
      for (let t = 0; t < count; t++) into[t] = pattern.value(at[t]!);
    });
  const valueGradsAt = pattern.valueGradsAt?.bind(pattern)
    ?? ((at: Float64Array, count: number, into: Float64Array, g: Float64Array): void => {
      for (let t = 0; t < count; t++) {
        into[t] = pattern.valueGrad(at[t]!, one);
        g.set(one, t * stride);
      }
    });

  // Node positions of pixels [first, first + count), pixel-major, then Legendre, then Hermite
  // node; the same arithmetic as a direct loop, so the results do not depend on the block size.
  const fillPositions = (x: Float64Array, first: number, count: number, offsets: Float64Array, width: number, sigma: number, blurCount: number): number => {
    let t = 0;
    for (let i = first; i < first + count; i++) {
      const xi = x[i]!;
      for (let k = 0; k < offsets.length; k++) {
        const position = xi + offsets[k]! * width;
        if (blurCount === 1) positions[t++] = position;
        else for (let j = 0; j < blurCount; j++) positions[t++] = position + blurOffsets[j]! * sigma;
      }
    }
    return t;
  };

  const evaluate = (x: Float64Array, params: Float64Array, out: Float64Array): void => {
    pattern.prepare(params);
    const background = params[iBackground]!;
    const slope = params[iSlope]!;
    const width = params[iPixel]!;
    const sigma = params[iBlur]!;
    // a zero-width pixel is a point sample: one node of weight 1
    const offsets = width === 0 ? singleOffset : pixelOffsets;
    const weights = width === 0 ? singleWeight : pixelWeights;
    const blurCount = sigma === 0 ? 1 : blurNodes;
    for (let first = 0; first < x.length; first += blockPixels) {
      const count = Math.min(blockPixels, x.length - first);
      valuesAt(positions, fillPositions(x, first, count, offsets, width, sigma, blurCount), values);
      let t = 0;
      for (let i = first; i < first + count; i++) {
        let total = 0;
        for (let k = 0; k < offsets.length; k++) {
          if (blurCount === 1) {
            total += weights[k]! * values[t++]!;
          } else {
            let blurred = 0;
            for (let j = 0; j < blurCount; j++) blurred += blurWeights[j]! * values[t++]!;
            total += weights[k]! * blurred;
          }
        }
        out[i] = background + slope * x[i]! + total;
      }
    }
  };

  // Weight, pixel offset and blur offset of each quadrature node of one pixel, set per call.
  const nodeWeights = new Float64Array(nodesPerPixel);
  const nodePixelOffsets = new Float64Array(nodesPerPixel);
  const nodeBlurOffsets = new Float64Array(nodesPerPixel);
  const jacobian = (x: Float64Array, params: Float64Array, jac: Float64Array, out?: Float64Array, columns?: Uint8Array): void => {
    pattern.prepare(params);
    // ∂P/∂x is needed only for the pixel-width and blur columns
    const wantSlopeX = !columns || columns[iPixel] !== 0 || columns[iBlur] !== 0;
    const background = params[iBackground]!;
    const slope = params[iSlope]!;
    const width = params[iPixel]!;
    const sigma = params[iBlur]!;
    const blurCount = sigma === 0 ? 1 : blurNodes;
    // at zero width the pixel-width derivative still needs ∂P/∂x · offset summed over nodes,
    // which is 0 by symmetry, so one node of weight 1 is exact
    const offsets = width === 0 ? singleOffset : pixelOffsets;
    const weights = width === 0 ? singleWeight : pixelWeights;
    const nodes = offsets.length * blurCount;
    for (let k = 0, q = 0; k < offsets.length; k++) {
      for (let j = 0; j < blurCount; j++, q++) {
        nodeWeights[q] = sigma === 0 ? weights[k]! : weights[k]! * blurWeights[j]!;
        nodePixelOffsets[q] = offsets[k]!;
        nodeBlurOffsets[q] = sigma === 0 ? 0 : blurOffsets[j]!;
      }
    }
    for (let first = 0; first < x.length; first += blockPixels) {
      const count = Math.min(blockPixels, x.length - first);
      valueGradsAt(positions, fillPositions(x, first, count, offsets, width, sigma, blurCount), values, grads);
      for (let i = first, t = 0; i < first + count; i++, t += nodes) {
        const xi = x[i]!;
        let total = 0;
        let dWidth = 0;
        let dSigma = 0;
        for (let q = 0; q < nodes; q++) {
          const weight = nodeWeights[q]!;
          total += weight * values[t + q]!;
          if (wantSlopeX) {
            const slopeX = weight * grads[(t + q) * stride + np]!;
            dWidth += slopeX * nodePixelOffsets[q]!;
            dSigma += slopeX * nodeBlurOffsets[q]!;
          }
        }
        const row = i * p;
        jac[row + iBackground] = 1;
        jac[row + iSlope] = xi;
        jac[row + iPixel] = dWidth;
        jac[row + iBlur] = dSigma;
        if (out) out[i] = background + slope * xi + total;
      }
      // optical columns one at a time, each pixel's sum kept in a register; masked columns are 0
      for (let m = 0; m < np; m++) {
        const wanted = !columns || columns[m] !== 0;
        for (let i = first, t = 0; i < first + count; i++, t += nodes) {
          let sum = 0;
          if (wanted) for (let q = 0; q < nodes; q++) sum += nodeWeights[q]! * grads[(t + q) * stride + m]!;
          jac[i * p + m] = sum;
        }
      }
    }
  };

  return { id: pattern.id, description: pattern.description, parameters, evaluate, jacobian };
}
