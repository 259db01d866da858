import { readFileSync } from "node:fs";
import { encode as encodePng } from "fast-png";
import { describe, expect, it } from "vitest";
import { createRandom, frameToLine, readImage, readProfile, type ImageStack } from "../../src/advanced.js";
import { writeTiff } from "./writeTiff.js";

const corpus = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`./corpus/${name}`, import.meta.url)));

// The demo scene written by corpus/make_corpus.py (Python struct + zlib, independent of the decoders).
const W = 32, H = 8;
const scene = (c: number): number => Math.round(1000 + 800 * Math.cos((2 * Math.PI * (c - (W - 1) / 2)) / 8));

describe("readImage(bytes) decodes the Python-written corpus images", () => {
  it.each(["good16.png", "good16-le.tif", "good16-be.tif"])("readImage(%s) holds the scene's 16-bit codes", (name) => {
    const stack = readImage(corpus(name), name);
    expect([stack.width, stack.height, stack.bitDepth, stack.topCode]).toEqual([W, H, 16, 65535]);
    for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) expect(stack.pages[0]![r * W + c]).toBe(scene(c));
  });

  it("readImage(good8.png) and (good-rgb8.png): 8-bit grey and RGB averaged to grey", () => {
    const grey = readImage(corpus("good8.png"), "g");
    const rgb = readImage(corpus("good-rgb8.png"), "c");
    expect(grey.topCode).toBe(255);
    expect(rgb.integerCodes).toBe(false);
    for (let c = 0; c < W; c++) {
      expect(grey.pages[0]![c]).toBe(Math.floor(scene(c) / 8));
      expect(rgb.pages[0]![c]).toBe(Math.floor(scene(c) / 8));
    }
  });

  it("readImage(good-float.tif) reads big-endian 32-bit floats", () => {
    const stack = readImage(corpus("good-float.tif"), "f");
    expect(stack.sampleFormat).toBe("float");
    for (let c = 0; c < W; c++) expect(stack.pages[0]![c]).toBeCloseTo(scene(c) / 1000, 6);
  });

  it("readProfile(good-stack.tif) averages the three pages", () => {
    const { profile } = readProfile(corpus("good-stack.tif"), { source: "s", pixelPitch: 1e-5, tilt: 0 });
    for (let c = 0; c < W; c++) expect(profile.y[c]).toBeCloseTo(scene(c) + 2, 4);
    expect(profile.x[3]).toBeCloseTo(3e-5, 15);
  });

  it("readImage decodes Deflate and PackBits TIFFs through utif2", () => {
    const pixels = Uint16Array.from({ length: 64 * 16 }, (_, i) => (i * 37) % 4096);
    for (const compression of ["deflate", "packbits"] as const) {
      const stack = readImage(writeTiff(64, 16, [pixels], { compression }), compression);
      expect(Array.from(stack.pages[0]!)).toEqual(Array.from(pixels));
    }
  });
});

/** A W × H frame of fringes with period `period` px, normal tilted by `tilt` rad, plus offsets. */
function tiltedFrame(width: number, height: number, tilt: number, period: number, extra?: (c: number, r: number) => number): Uint16Array {
  const out = new Uint16Array(width * height);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const u = (c - (width - 1) / 2) * Math.cos(tilt) + (r - (height - 1) / 2) * Math.sin(tilt);
      out[r * width + c] = Math.round(2000 + 1500 * Math.cos((2 * Math.PI * u) / period) + (extra ? extra(c, r) : 0));
    }
  }
  return out;
}

describe("frameToLine(stack, options)", () => {
  it("frameToLine measures a 2° tilt within 0.05° and restores the fringe contrast", () => {
    const width = 256, height = 128, tilt = (2 * Math.PI) / 180;
    const png = encodePng({ width, height, data: tiltedFrame(width, height, tilt, 16), depth: 16, channels: 1 });
    const stack = readImage(png, "tilted.png");
    const line = frameToLine(stack, { source: "tilted.png" });
    // Truth is the angle the frame was built with (common practice for synthetic checks).
    expect(Math.abs(line.tilt - tilt)).toBeLessThan((0.05 * Math.PI) / 180);
    const flat = frameToLine(stack, { tilt: 0 });
    const contrast = (y: Float64Array): number => {
      const mid = y.subarray(40, 216);
      return (Math.max(...mid) - Math.min(...mid)) / (Math.max(...mid) + Math.min(...mid));
    };
    // the frame's own fringes have contrast 1500/2000 = 0.75 (tiltedFrame); averaging across a tilt would wash them out
    expect(contrast(line.y)).toBeGreaterThan(0.7);
    expect(contrast(flat.y)).toBeLessThan(contrast(line.y) - 0.05);
  });

  it("frameToLine subtracts the dark frame, divides the flat, repairs hot pixels and masks saturation", () => {
    const width = 64, height = 32;
    const frame = tiltedFrame(width, height, 0, 16, () => 100);
    frame[5 * width + 20] = 4000; // hot pixel
    for (let r = 0; r < height; r++) frame[r * width + 40] = 4095; // saturated column, 12-bit camera in 16-bit words
    frame[0] = 4095;
    const dark = new Uint16Array(width * height).fill(100);
    const flat = new Uint16Array(width * height).fill(1000);
    const stack = readImage(writeTiff(width, height, [frame]), "f.tif");
    const line = frameToLine(stack, {
      source: "f.tif", tilt: 0, roi: { x: 2, y: 1, width: 60, height: 30 },
      dark: readImage(writeTiff(width, height, [dark]), "d.tif"), flat: readImage(writeTiff(width, height, [flat]), "l.tif"),
    });
    expect(line.pixel[0]).toBe(2); // the region starts at column 2
    const k = 20 - 2;
    // (frame − dark) / flat × mean flat gives back the scene tiltedFrame drew (hand calculation)
    expect(line.y[k]).toBeCloseTo(2000 + 1500 * Math.cos((2 * Math.PI * (20 - 31.5)) / 16), -1);
    expect(line.warnings.join(" ")).toMatch(/1 hot pixels replaced by the mean of their neighbours at \(column, row\) \(20, 5\)/);
    expect(line.mask[40 - 2]).toBe(0);
    expect(line.warnings.join(" ")).toMatch(/30 saturated pixels \(code 4095\) masked: 1 profile samples at pixel 40/);
  });
});

describe("frameToLine σ from successive row differences", () => {
  it("frameToLine gives σ ≈ σ_pixel/√rows although the intensity changes slowly along the fringes", () => {
    // Gaussian pixel noise of known σ = 20 (seeded); the standard error of a mean of n rows is
    // σ/√n (common practice). A slow Gaussian beam profile along the rows must not inflate it.
    const width = 200, height = 400, noise = 20;
    const random = createRandom(3);
    const page = new Float32Array(width * height);
    for (let r = 0; r < height; r++) {
      const beam = Math.exp(-(((r - height / 2) / 150) ** 2));
      for (let c = 0; c < width; c++) page[r * width + c] = 1000 + 2000 * beam * (1 + Math.cos((2 * Math.PI * c) / 25)) + noise * random.normal();
    }
    const stack: ImageStack = { width, height, bitDepth: 32, sampleFormat: "float", pages: [page], integerCodes: false, topCode: undefined, format: "tiff", notes: [] };
    const line = frameToLine(stack, { tilt: 0, repairHotPixels: false });
    const expected = noise / Math.sqrt(height);
    const mean = line.sigma.reduce((a, b) => a + b, 0) / line.sigma.length;
    expect(Math.abs(mean / expected - 1)).toBeLessThan(0.05); // 5 %: the scatter of a σ estimate from ~400 rows (common practice)
    // The plain scatter across rows would be dominated by the beam profile:
    let scatter = 0;
    for (let r = 0; r < height; r++) scatter += (page[r * width]! - line.y[0]!) ** 2;
    expect(Math.sqrt(scatter / (height - 1)) / Math.sqrt(height)).toBeGreaterThan(10 * expected);
  });
});
