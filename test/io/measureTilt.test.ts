import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { createRandom, measureTilt, readImage } from "../../src/advanced.js";

const DEG = Math.PI / 180;

/**
 * A frame of fringes whose normal is tilted by `tilt` rad from the rows' x axis, drawn from the
 * geometry itself: u = (c − c0) cos θ + (r − r0) sin θ, I = background + peak · g · (1 + V cos(2π u / period)),
 * with g a Gaussian beam; Poisson counts from a seeded stream; values above `top` clipped to it
 * and flagged, as a saturated detector does.
 */
function frame(options: { tilt: number; seed: number; width?: number; height?: number; period?: number; peak?: number; top?: number; beam?: boolean }) {
  const { tilt, seed, width = 512, height = 256, period = 40, peak = 800, top = Infinity, beam = false } = options;
  const random = createRandom(seed);
  const pixels = new Float32Array(width * height);
  const skip = new Uint8Array(width * height);
  const c0 = (width - 1) / 2, r0 = (height - 1) / 2;
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const u = (c - c0) * Math.cos(tilt) + (r - r0) * Math.sin(tilt);
      const g = beam ? Math.exp(-((u / (0.4 * width)) ** 2) - ((r - r0) / (0.5 * height)) ** 2) : 1;
      const counts = random.poisson(40 + peak * g * (1 + 0.9 * Math.cos((2 * Math.PI * u) / period)) / 2);
      pixels[r * width + c] = Math.min(counts, top);
      if (counts >= top) skip[r * width + c] = 1;
    }
  }
  return { pixels, skip, width, height };
}

// Tolerance 0.05°: at 800 counts peak (Poisson σ ≈ 20–30 counts) on 512 × 256 pixels, the phase of
// one row's fringe component scatters by ≈ √2 σ / (A √N) ≈ 0.01 rad, and a line through 256 such
// phases has a slope spread ≈ 0.01 · √(12 / 256³) rad/row, i.e. ≈ 0.003° of tilt at a 40-pixel
// period (least-squares slope variance, common practice). 0.05° leaves room for the small bias
// of windowed demodulation and is what a profile averaged over 256 rows needs: a tilt error δ
// smears a 40-pixel fringe by 256 · δ ≈ 0.2 pixel.
const TOLERANCE = 0.05 * DEG;

describe("measureTilt(pixels, width, height, skip?)", () => {
  it.each([0, 0.5, -0.5, 1.5, 2, 5, -5])("measureTilt finds a %s° tilt within 0.05° under Poisson noise (800 counts, three seeds)", (degrees) => {
    for (const seed of [1, 2, 3]) {
      const { pixels, width, height } = frame({ tilt: degrees * DEG, seed });
      const got = measureTilt(pixels, width, height);
      expect(Math.abs(got - degrees * DEG), `seed ${seed}: got ${got / DEG}°, expected ${degrees}° ± 0.05°`).toBeLessThan(TOLERANCE);
    }
  });

  it.each([1.5, 2, -2])("measureTilt finds a %s° tilt within 0.05° with a Gaussian beam and a saturated central band left out", (degrees) => {
    // Peak 6000 counts clipped at 4095 (12-bit top code): the central fringes are flat plateaus.
    const { pixels, skip, width, height } = frame({ tilt: degrees * DEG, seed: 7, peak: 6000, top: 4095, beam: true, period: 64 });
    let flagged = 0;
    for (const s of skip) flagged += s;
    expect(flagged).toBeGreaterThan(0.05 * width * height);
    const got = measureTilt(pixels, width, height, skip);
    expect(Math.abs(got - degrees * DEG), `got ${got / DEG}°`).toBeLessThan(TOLERANCE);
  });

  it("measureTilt ignores a fixed column pattern near the Nyquist frequency", () => {
    // Cameras read out alternate columns through different amplifiers (common practice): ±30 counts.
    const { pixels, width, height } = frame({ tilt: 2 * DEG, seed: 11, period: 120 });
    for (let i = 0; i < pixels.length; i++) pixels[i] = pixels[i]! + (i % 2 === 0 ? 30 : -30);
    expect(Math.abs(measureTilt(pixels, width, height) - 2 * DEG)).toBeLessThan(TOLERANCE);
  });

  it("measureTilt(frame-pair-C.png − dark-pair-C.png) reads the demo's 1.50° within 0.05°", () => {
    // Truth 1.50° from the demo data's truths.json (simulated scene, central fringes saturated at 4095).
    const data = (name: string) => new Uint8Array(readFileSync(new URL(`../../notebooks-demo/data/${name}`, import.meta.url)));
    const truths = JSON.parse(readFileSync(new URL("../../notebooks-demo/data/truths.json", import.meta.url), "utf8")) as { frame: { tilt: number } };
    const stack = readImage(data("frame-pair-C.png"), "frame-pair-C.png");
    const dark = readImage(data("dark-pair-C.png"), "dark-pair-C.png");
    const n = stack.width * stack.height;
    const values = new Float32Array(n);
    const skip = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      values[i] = stack.pages[0]![i]! - dark.pages[0]![i]!;
      if (stack.pages[0]![i] === 4095) skip[i] = 1;
    }
    expect(truths.frame.tilt).toBeCloseTo(1.5 * DEG, 12);
    const got = measureTilt(values, stack.width, stack.height, skip);
    expect(Math.abs(got - truths.frame.tilt), `got ${got / DEG}°`).toBeLessThan(TOLERANCE);
  });

  it("measureTilt returns 0 for a frame with no fringes, a single row pair or a narrow strip", () => {
    const flat = new Float32Array(64 * 32).fill(500);
    expect(measureTilt(flat, 64, 32)).toBe(0);
    expect(measureTilt(new Float32Array(64 * 2), 64, 2)).toBe(0);
    expect(measureTilt(new Float32Array(8 * 40), 8, 40)).toBe(0);
  });
});
