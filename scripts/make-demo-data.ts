/**
 * Writes the simulated demo data of notebooks-demo/data/ (run: `npx tsx scripts/make-demo-data.ts [FOLDER]`).
 *
 * Invented scenario: a lab qualifies a new fibre-coupled superluminescent diode ("source B",
 * about 680 nm) for a two-beam interferometer. Everything here is simulated with fringekit's
 * own models (src/physics) and seeded noise (src/random.ts); the truths go to truths.json so
 * the demo notebooks can check their results against them. Same seeds → same bytes.
 *
 * Detector effects: 12-bit counts (top code 4095) with Poisson shot noise, Gaussian read noise
 * and a dark offset; one saturated camera frame; a few hot pixels; a dark frame.
 */
import { mkdirSync } from "node:fs";
import { writeFileAtomicSync } from "../kernel-ext/figures/atomicWrite.js";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { encode } from "fast-png";
import { setPngDpi } from "../src/report/render/pngDensity.js";
import {
  coherenceDiscModel,
  createRandom,
  getModel,
  nearFieldModel,
  paramVector,
  pixelPositions,
  simulateProfile,
  twoSlitBroadbandModel,
  twoSlitModel,
  type Random,
} from "../src/advanced.js";

/** Output folder: notebooks-demo/data/, or the folder given as the first argument (tests use a temporary one). */
const dataDir = process.argv[2] ?? join(dirname(fileURLToPath(import.meta.url)), "..", "notebooks-demo", "data");
/** 12-bit camera: largest code. */
const TOP_CODE = 4095;

/** Writes a file atomically (the project's one writer). */
function writeAtomic(name: string, content: string | Uint8Array): void {
  const target = join(dataDir, name);
  mkdirSync(dirname(target), { recursive: true });
  writeFileAtomicSync(target, content);
}

/** Camera-line table: position (mm) and 12-bit counts, with a short comment header. */
function lineTable(comment: string[], x: Float64Array, counts: ArrayLike<number>): string {
  const lines = comment.map((c) => `# ${c}`);
  lines.push("position (mm),signal (counts)");
  for (let i = 0; i < x.length; i++) lines.push(`${(x[i]! * 1e3).toFixed(5)},${counts[i]}`);
  return `${lines.join("\n")}\n`;
}

/** Dark offset + read noise added to Poisson counts, clipped to the 12-bit range. */
function toCodes(counts: ArrayLike<number>, rng: Random, darkOffset: number, readNoise: number): Uint16Array {
  const out = new Uint16Array(counts.length);
  for (let i = 0; i < counts.length; i++) {
    const value = Math.round(counts[i]! + darkOffset + readNoise * rng.normal());
    out[i] = Math.min(TOP_CODE, Math.max(0, value));
  }
  return out;
}

const lambda0 = 680e-9; // centre wavelength of source B (m)
const pitch = 5.5e-6; // camera pixel pitch (m)

// Amplitudes are coherent peaks above background (every model's meaning of amplitude).
// 1. Camera line through slit pair A, unfiltered source (bandwidth visible as fringe fading).
const lineA = {
  file: "line-pair-A.csv",
  model: "two-slit-broadband",
  truth: {
    amplitude: 3600, center: 0.21e-3, separation: 0.6e-3, width: 0.06e-3, visibility: 0.88, phase: 0.4,
    wavelength: lambda0, bandwidth: 30e-9, distance: 0.75, background: 95, backgroundSlope: 0, pixelWidth: pitch, blur: 0,
  },
  pixels: 2048,
  seed: 101,
};
{
  const x = pixelPositions(lineA.pixels, pitch);
  const sim = simulateProfile(twoSlitBroadbandModel(), lineA.truth, x, { noise: "poisson", seed: lineA.seed });
  const codes = toCodes(sim.y, createRandom(lineA.seed + 1), 0, 2);
  writeAtomic(lineA.file, lineTable([
    "SIMULATED demo data (scripts/make-demo-data.ts): camera line through slit pair A, source B unfiltered",
    "camera: 2048 pixels, pitch 5.5 um, 12-bit; slits to camera 0.750 m; centre wavelength 680 nm",
  ], x, codes));
}

// 2. Coherence scan: source B behind a 1 nm filter lights a 0.20 mm pinhole 0.40 m before a set of
//    slit pairs; one camera line per pair. Visibility follows the van Cittert–Zernike curve.
const scan = {
  pinholeDiameter: 0.2e-3,
  sourceDistance: 0.4,
  opticsVisibility: 0.95,
  separations: [0.25e-3, 0.45e-3, 0.65e-3, 0.85e-3, 1.05e-3, 1.25e-3, 1.45e-3],
  width: 0.05e-3,
  distance: 0.75,
  amplitude: 3000,
  background: 60,
  pixels: 1024,
  seedBase: 200,
};
const scanTruth: { file: string; separation: number; visibility: number; center: number; phase: number }[] = [];
{
  const coherence = coherenceDiscModel();
  const d = Float64Array.from(scan.separations);
  const visibilities = new Float64Array(d.length);
  coherence.evaluate(d, paramVector(coherence, {
    visibility: scan.opticsVisibility, diameter: scan.pinholeDiameter, sourceDistance: scan.sourceDistance, wavelength: lambda0,
  }), visibilities);
  const x = pixelPositions(scan.pixels, pitch);
  scan.separations.forEach((separation, k) => {
    const rng = createRandom(scan.seedBase + 50 + k);
    const truth = {
      amplitude: scan.amplitude, center: (rng.uniform() - 0.5) * 0.2e-3, separation, width: scan.width,
      visibility: visibilities[k]!, phase: rng.uniform() * 2 * Math.PI - Math.PI,
      wavelength: lambda0, distance: scan.distance, background: scan.background, pixelWidth: pitch,
    };
    const sim = simulateProfile(twoSlitModel(), truth, x, { noise: "poisson", seed: scan.seedBase + k });
    const file = `scan/scan-d${(separation * 1e3).toFixed(2)}mm.csv`;
    writeAtomic(file, lineTable([
      `SIMULATED demo data (scripts/make-demo-data.ts): coherence scan, slit pair with nominal separation ${(separation * 1e3).toFixed(2)} mm`,
      "source B behind a 1 nm filter; pinhole 0.40 m before the slits; camera 0.750 m after them; pitch 5.5 um",
    ], x, toCodes(sim.y, rng, 0, 2)));
    scanTruth.push({ file, separation, visibility: visibilities[k]!, center: truth.center, phase: truth.phase });
  });
}

// 3. Camera frame through slit pair C (filtered source): fringes tilted by 1.5°, centre saturated,
//    hot pixels, and a dark frame taken with the beam blocked.
const frame = {
  file: "frame-pair-C.png",
  darkFile: "dark-pair-C.png",
  width: 1024,
  height: 200,
  tilt: (1.5 * Math.PI) / 180,
  darkOffset: 64,
  readNoise: 3,
  truth: {
    amplitude: 4800, center: 0.1e-3, separation: 0.5e-3, width: 0.07e-3, visibility: 0.9, phase: 1.1,
    wavelength: lambda0, distance: 0.6, background: 40, pixelWidth: pitch,
  },
  hotPixels: [] as { column: number; row: number; value: number }[],
  seed: 300,
};
{
  const rng = createRandom(frame.seed);
  const model = twoSlitModel();
  const { width: w, height: h } = frame;
  // Position along the fringe normal of each pixel (m), measured from the frame's middle.
  const along = new Float64Array(w * h);
  const cos = Math.cos(frame.tilt), sin = Math.sin(frame.tilt);
  for (let r = 0; r < h; r++) {
    for (let c = 0; c < w; c++) along[r * w + c] = ((c - (w - 1) / 2) * cos + (r - (h - 1) / 2) * sin) * pitch;
  }
  // The model needs increasing positions: evaluate on a fine grid and interpolate.
  const grid = pixelPositions(4 * w + 400, pitch / 4);
  const mean = new Float64Array(grid.length);
  model.evaluate(grid, paramVector(model, { ...frame.truth, pixelWidth: 0 }), mean);
  const step = pitch / 4;
  const first = grid[0]!;
  const signal = new Float64Array(w * h);
  for (let i = 0; i < w * h; i++) {
    const t = (along[i]! - first) / step;
    const j = Math.min(grid.length - 2, Math.max(0, Math.floor(t)));
    const f = t - j;
    signal[i] = rng.poisson(mean[j]! * (1 - f) + mean[j + 1]! * f);
  }
  // Dark frame: offset with a faint column pattern, read noise; two hot pixels that are always hot.
  const columnPattern = Float64Array.from({ length: w }, () => 2 * rng.normal());
  const darkMean = Float64Array.from({ length: w * h }, (_, i) => frame.darkOffset + columnPattern[i % w]!);
  const steadyHot = [{ column: 311, row: 57, value: 900 }, { column: 702, row: 141, value: 1400 }];
  const dark = new Uint16Array(w * h);
  for (let i = 0; i < w * h; i++) dark[i] = Math.min(TOP_CODE, Math.max(0, Math.round(darkMean[i]! + frame.readNoise * rng.normal())));
  const light = new Uint16Array(w * h);
  for (let i = 0; i < w * h; i++) {
    light[i] = Math.min(TOP_CODE, Math.max(0, Math.round(signal[i]! + darkMean[i]! + frame.readNoise * rng.normal())));
  }
  for (const p of steadyHot) {
    dark[p.row * w + p.column] = p.value;
    light[p.row * w + p.column] = Math.min(TOP_CODE, light[p.row * w + p.column]! + p.value);
  }
  // Hot pixels in the light frame only (they do not subtract out).
  frame.hotPixels = [
    { column: 150, row: 30, value: 3000 }, { column: 488, row: 120, value: 2500 },
    { column: 860, row: 170, value: 3500 }, { column: 640, row: 12, value: 2800 },
  ];
  for (const p of frame.hotPixels) light[p.row * w + p.column] = Math.min(TOP_CODE, light[p.row * w + p.column]! + p.value);
  // pHYs chunk (pixels per metre), so readers get the pitch from the file.
  const dpi = 0.0254 / pitch;
  writeAtomic(frame.file, setPngDpi(encode({ width: w, height: h, data: light, depth: 16, channels: 1 }), dpi));
  writeAtomic(frame.darkFile, setPngDpi(encode({ width: w, height: h, data: dark, depth: 16, channels: 1 }), dpi));
}

// 4. Near-field set-up: a wide slit pair only 0.12 m before the camera (slit Fresnel number ≈ 3).
const nearField = {
  file: "line-nearfield.csv",
  model: "two-slit-fresnel",
  truth: {
    // amplitude = far-field coherent peak; illuminating intensity 800 counts = amplitude · λL/(N a)²
    amplitude: (800 * (2 * 0.5e-3) ** 2) / (lambda0 * 0.12), center: -0.05e-3, separation: 1.2e-3, width: 0.5e-3, slits: 2,
    wavelength: lambda0, distance: 0.12, background: 50, backgroundSlope: 0, pixelWidth: pitch, blur: 0,
  },
  pixels: 1024,
  seed: 400,
};
{
  const x = pixelPositions(nearField.pixels, pitch);
  const sim = simulateProfile(nearFieldModel(), nearField.truth, x, { noise: "poisson", seed: nearField.seed });
  writeAtomic(nearField.file, lineTable([
    "SIMULATED demo data (scripts/make-demo-data.ts): camera line 0.120 m behind a wide slit pair (pair D)",
    "source B behind a 1 nm filter (680 nm); camera pitch 5.5 um, 12-bit",
  ], x, toCodes(sim.y, createRandom(nearField.seed + 1), 0, 2)));
}

const fresnelNumber = nearField.truth.width ** 2 / (lambda0 * nearField.truth.distance);
const truths = {
  note: "SIMULATED data: truths used by scripts/make-demo-data.ts (SI units: m, rad, counts)",
  pixelPitch: pitch,
  topCode: TOP_CODE,
  lineA: { file: lineA.file, model: lineA.model, ...lineA.truth, coherenceLength: lambda0 ** 2 / lineA.truth.bandwidth },
  coherenceScan: {
    model: "coherence-disc",
    diameter: scan.pinholeDiameter,
    sourceDistance: scan.sourceDistance,
    wavelength: lambda0,
    visibility: scan.opticsVisibility,
    width: scan.width,
    distance: scan.distance,
    lines: scanTruth,
  },
  frame: {
    file: frame.file, darkFile: frame.darkFile, model: "two-slit", frameWidth: frame.width, frameHeight: frame.height,
    tilt: frame.tilt,
    centerFromFirstColumn: ((frame.width - 1) / 2) * pitch + frame.truth.center,
    darkOffset: frame.darkOffset, readNoise: frame.readNoise, hotPixels: frame.hotPixels, ...frame.truth,
  },
  nearField: { file: nearField.file, model: nearField.model, ...nearField.truth, fresnelNumber },
};
writeAtomic("truths.json", `${JSON.stringify(truths, null, 2)}\n`);
// getModel is imported so a renamed model id fails here, not in the notebooks.
for (const id of [lineA.model, nearField.model, "coherence-disc", "two-slit"]) getModel(id);
process.stdout.write(`demo data written to ${dataDir} (slit Fresnel number of the near-field line: ${fresnelNumber.toFixed(2)})\n`);
