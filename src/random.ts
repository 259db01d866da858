/**
 * Seeded pseudo-random numbers for simulations, demos and benchmarks.
 *
 * Generator: xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number
 * generators", ACM TOMS 47 (2021)), 128-bit state in four 32-bit words, period 2^128 − 1.
 * The state is seeded from a 32-bit seed by SplitMix32 (Steele, Lea & Flood, OOPSLA 2014
 * mixing), so nearby seeds give unrelated streams. Not for cryptography.
 */
import { InvalidArgumentError } from "./errors.js";

/** A seeded random stream. Same seed → same sequence on every platform. */
export interface Random {
  /** Next raw 32-bit unsigned integer. */
  nextUint32(): number;
  /** Uniform double in [0, 1) with 53 random bits. */
  uniform(): number;
  /** Standard normal deviate (mean 0, variance 1), Marsaglia polar method. */
  normal(): number;
  /**
   * Poisson deviate with the given mean (≥ 0, finite). Exact sampling: sequential-search
   * inversion for mean < 10; for mean ≥ 10 the transformed-rejection method PTRS of
   * W. Hörmann, "The transformed rejection method for generating Poisson random variables",
   * Insurance: Mathematics and Economics 12 (1993) 39–45.
   */
  poisson(mean: number): number;
}

/**
 * Creates a seeded xoshiro128** stream.
 * @param seed any finite number; its low 32 bits (after truncation) select the stream.
 * @example const rng = createRandom(42); rng.normal(); // same value on every run
 */
export function createRandom(seed: number): Random {
  if (!Number.isFinite(seed)) throw new InvalidArgumentError("seed", seed, "a finite number");
  let mix = Math.trunc(seed) >>> 0;
  const splitmix32 = (): number => {
    mix = (mix + 0x9e3779b9) >>> 0;
    let z = mix;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  };
  let s0 = splitmix32();
  let s1 = splitmix32();
  let s2 = splitmix32();
  let s3 = splitmix32();
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1; // the all-zero state is the one fixed point

  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = rotl(s3, 11);
    return result;
  };

  const uniform = (): number => {
    const high = nextUint32() >>> 5; // 27 bits
    const low = nextUint32() >>> 6; // 26 bits
    return (high * 67108864 + low) / 9007199254740992; // (high·2^26 + low) / 2^53
  };

  let spare = 0;
  let hasSpare = false;
  const normal = (): number => {
    if (hasSpare) {
      hasSpare = false;
      return spare;
    }
    let u: number;
    let v: number;
    let r2: number;
    do {
      u = 2 * uniform() - 1;
      v = 2 * uniform() - 1;
      r2 = u * u + v * v;
    } while (r2 >= 1 || r2 === 0);
    const factor = Math.sqrt((-2 * Math.log(r2)) / r2);
    spare = v * factor;
    hasSpare = true;
    return u * factor;
  };

  const poisson = (mean: number): number => {
    if (!(mean >= 0) || !Number.isFinite(mean)) {
      throw new InvalidArgumentError("poisson mean", mean, "a finite number ≥ 0");
    }
    if (mean === 0) return 0;
    if (mean < 10) return poissonInversion(mean, uniform);
    return poissonPtrs(mean, uniform);
  };

  return { nextUint32, uniform, normal, poisson };
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/** Sequential search of the cumulative distribution: exact, O(mean) work, fine for mean < 10. */
function poissonInversion(mean: number, uniform: () => number): number {
  let u = uniform();
  let k = 0;
  let p = Math.exp(-mean);
  while (u > p) {
    u -= p;
    k += 1;
    p *= mean / k;
    if (p === 0) break; // far tail: underflow, return the count reached
  }
  return k;
}

/** Hörmann's PTRS (1993), constants as published there; valid for mean ≥ 10. */
function poissonPtrs(mean: number, uniform: () => number): number {
  const sqrtMean = Math.sqrt(mean);
  const logMean = Math.log(mean);
  const b = 0.931 + 2.53 * sqrtMean;
  const a = -0.059 + 0.02483 * b;
  const invAlpha = 1.1239 + 1.1328 / (b - 3.4);
  const vr = 0.9277 - 3.6224 / (b - 2);
  for (;;) {
    const u = uniform() - 0.5;
    const v = uniform();
    const us = 0.5 - Math.abs(u);
    const k = Math.floor(((2 * a) / us + b) * u + mean + 0.43);
    if (us >= 0.07 && v <= vr) return k;
    if (k < 0 || (us < 0.013 && v > us)) continue;
    const lhs = Math.log(v * invAlpha / (a / (us * us) + b));
    const rhs = -mean + k * logMean - logGamma(k + 1);
    if (lhs <= rhs) return k;
  }
}

/**
 * ln Γ(x) for x > 0: Lanczos approximation with g = 7, n = 9 (relative error about 1e-15;
 * checked in test/random.test.ts through the Poisson probabilities).
 */
function logGamma(x: number): number {
  if (x < 0.5) {
    // reflection: Γ(x)Γ(1 − x) = π / sin(πx)
    return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0]!;
  for (let i = 1; i < 9; i++) sum += LANCZOS[i]! / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];
