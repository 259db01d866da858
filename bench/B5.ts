// B5 of ../shared/bench/PROBLEMS.md: a 2048 × 2048 16-bit camera frame (PNG and TIFF) with
// fringes tilted by 2°, a dark frame and a region of interest → de-tilted, dark-subtracted line
// profile. Time (median of 5 after a warm-up) and peak memory (max RSS of a fresh process).
// Reference in the same run: NumPy (Debian python3-numpy) doing the same steps on the same
// files — decode (zlib for PNG, raw strips for TIFF), dark subtraction, gradient-tensor tilt,
// shear by linear interpolation, mean over rows.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { encode as encodePng } from "fast-png";
import { createRandom } from "../src/random.js";
import { frameToLine, readImage } from "../src/io/index.js";
import { writeTiff } from "../test/io/writeTiff.js";

const SIZE = 2048;
const TILT = (2 * Math.PI) / 180;
const ROI = { x: 24, y: 624, width: 2000, height: 800 };
const PYTHON = "/usr/bin/python3";
const THIS = fileURLToPath(import.meta.url);

/** Invented demo frame: 12-bit-like fringes of period 64 px under a Gaussian beam, tilted 2°, Poisson counts + dark offset. */
function makeFrames(): { frame: Uint16Array; dark: Uint16Array } {
  const random = createRandom(5);
  const frame = new Uint16Array(SIZE * SIZE);
  const dark = new Uint16Array(SIZE * SIZE);
  const c = (SIZE - 1) / 2;
  for (let r = 0; r < SIZE; r++) {
    for (let k = 0; k < SIZE; k++) {
      const u = (k - c) * Math.cos(TILT) + (r - c) * Math.sin(TILT);
      const envelope = Math.exp(-(((r - c) / 700) ** 2)) * Math.exp(-((u / 900) ** 2));
      const mean = 60 + 3000 * envelope * (1 + 0.8 * Math.cos((2 * Math.PI * u) / 64));
      const darkMean = 60;
      frame[r * SIZE + k] = Math.min(65535, random.poisson(mean));
      dark[r * SIZE + k] = random.poisson(darkMean);
    }
  }
  return { frame, dark };
}

/** Child-process work: frame → profile `repeats` times; prints times, tilt and max RSS as JSON. */
function child(framePath: string, darkPath: string, repeats: number): void {
  const times: number[] = [];
  let tilt = 0;
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    const stack = readImage(new Uint8Array(readFileSync(framePath)), framePath);
    const dark = readImage(new Uint8Array(readFileSync(darkPath)), darkPath);
    const line = frameToLine(stack, { roi: ROI, dark, source: framePath });
    times.push(performance.now() - t0);
    tilt = line.tilt;
  }
  process.stdout.write(JSON.stringify({ times, tilt, maxRssMB: process.resourceUsage().maxRSS / 1024 }));
}

const NUMPY = String.raw`
import json, resource, sys, time, zlib
import numpy as np
path, dark_path, repeats = sys.argv[1], sys.argv[2], int(sys.argv[3])
x0, y0, w, h = 24, 624, 2000, 800
def read(p):
    b = open(p, "rb").read()
    if b[:8] == b"\x89PNG\r\n\x1a\n":
        i, idat, size = 8, [], None
        while i < len(b):
            n = int.from_bytes(b[i:i+4], "big"); kind = b[i+4:i+8]
            if kind == b"IHDR": size = (int.from_bytes(b[i+8:i+12], "big"), int.from_bytes(b[i+12:i+16], "big"))
            if kind == b"IDAT": idat.append(b[i+8:i+8+n])
            i += 12 + n
        raw = np.frombuffer(zlib.decompress(b"".join(idat)), np.uint8).reshape(size[1], 1 + 2 * size[0])
        assert not raw[:, 0].any(), "reference decodes unfiltered PNG rows only"
        return raw[:, 1:].copy().view(">u2").astype(np.float32)
    offset = int.from_bytes(b[4:8], "little")
    count = int.from_bytes(b[offset:offset+2], "little")
    tags = {}
    for e in range(count):
        at = offset + 2 + 12 * e
        tag, typ = int.from_bytes(b[at:at+2], "little"), int.from_bytes(b[at+2:at+4], "little")
        tags[tag] = int.from_bytes(b[at+8:at+10] if typ == 3 else b[at+8:at+12], "little")
    return np.frombuffer(b, "<u2", tags[256] * tags[257], tags[273]).reshape(tags[257], tags[256]).astype(np.float32)
times = []
for _ in range(repeats):
    t0 = time.perf_counter()
    v = read(path)[y0:y0+h, x0:x0+w] - read(dark_path)[y0:y0+h, x0:x0+w]
    gx = v[1:-1, 2:] - v[1:-1, :-2]; gy = v[2:, 1:-1] - v[:-2, 1:-1]
    theta = 0.5 * np.arctan2(2 * (gx * gy).sum(dtype=np.float64), (gx * gx).sum(dtype=np.float64) - (gy * gy).sum(dtype=np.float64))
    k = np.arange(w); xc = (w - 1) / 2; yc = (h - 1) / 2
    total = np.zeros(w); count = np.zeros(w)
    for r in range(h):
        x = xc + (k - xc - (r - yc) * np.sin(theta)) / np.cos(theta)
        ok = (x >= 0) & (x <= w - 1)
        total[ok] += np.interp(x[ok], k, v[r]); count[ok] += 1
    profile = total / np.maximum(count, 1)
    times.append((time.perf_counter() - t0) * 1e3)
print(json.dumps({"times": times, "tilt": float(theta), "maxRssMB": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
`;

const median = (values: number[]): number => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;

interface Outcome { times: number[]; tilt: number; maxRssMB: number }

function runChild(command: string, args: string[]): Outcome {
  const run = spawnSync(command, args, { encoding: "utf8", maxBuffer: 1 << 24 });
  if (run.status !== 0) throw new Error(`${command} failed: ${run.stderr}`);
  return JSON.parse(run.stdout) as Outcome;
}

/** Runs B5 and prints the figures; the last line is the summary. */
export async function main(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), "fringekit-b5-"));
  try {
    const { frame, dark } = makeFrames();
    const files = {
      png: [join(dir, "frame.png"), join(dir, "dark.png")],
      tiff: [join(dir, "frame.tif"), join(dir, "dark.tif")],
    } as const;
    writeFileSync(files.png[0], encodePng({ width: SIZE, height: SIZE, data: frame, depth: 16, channels: 1 }));
    writeFileSync(files.png[1], encodePng({ width: SIZE, height: SIZE, data: dark, depth: 16, channels: 1 }));
    writeFileSync(files.tiff[0], writeTiff(SIZE, SIZE, [frame]));
    writeFileSync(files.tiff[1], writeTiff(SIZE, SIZE, [dark]));
    const baseline = runChild(process.execPath, ["--import", "tsx", "-e", "process.stdout.write(JSON.stringify({times:[0],tilt:0,maxRssMB:process.resourceUsage().maxRSS/1024}))"]);
    let worstMs = 0;
    let worstMB = 0;
    for (const format of ["png", "tiff"] as const) {
      const [framePath, darkPath] = files[format];
      // First run in its own process gives the peak memory of one frame → profile; then 1 warm-up + 5 timed.
      const once = runChild(process.execPath, ["--import", "tsx", THIS, "--child", framePath, darkPath, "1"]);
      const timed = runChild(process.execPath, ["--import", "tsx", THIS, "--child", framePath, darkPath, "6"]);
      const reference = runChild(PYTHON, ["-c", NUMPY, framePath, darkPath, "6"]);
      const ms = median(timed.times.slice(1));
      const refMs = median(reference.times.slice(1));
      console.log(`B5 ${format}: fringekit ${ms.toFixed(0)} ms (tilt ${(timed.tilt * 180 / Math.PI).toFixed(3)}°), NumPy reference ${refMs.toFixed(0)} ms (tilt ${(reference.tilt * 180 / Math.PI).toFixed(3)}°), ratio ${(ms / refMs).toFixed(2)}; ` +
        `peak memory ${once.maxRssMB.toFixed(0)} MB (Node + tsx alone ${baseline.maxRssMB.toFixed(0)} MB), NumPy ${reference.maxRssMB.toFixed(0)} MB`);
      worstMs = Math.max(worstMs, ms);
      worstMB = Math.max(worstMB, once.maxRssMB);
    }
    console.log(`B5 frame-to-profile ${worstMs.toFixed(0)} ms, peak memory ${worstMB.toFixed(0)} MB`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === "--child") child(process.argv[3]!, process.argv[4]!, Number(process.argv[5]));
