// The PNG writer draws a figure in horizontal bands on two threads and joins separately
// compressed pieces into one zlib stream. Checked from outside: Python's zlib module (the zlib
// library; it verifies the stream's Adler-32, RFC 1950 §2.2) and Pillow (Debian python3-pil)
// read the files; the pixels are compared with one drawing of the whole figure.
import { figureFontsInstalled } from "./fontsInstalled.js";
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { decode } from "fast-png";
import { afterAll, describe, expect, it } from "vitest";
import { figureFonts } from "../../kernel-ext/figures/fonts.js";
import { openClips, planRasterBands } from "../../kernel-ext/figures/rasterBands.js";
import { adler32Combine, sceneToPng } from "../../kernel-ext/figures/rasterize.js";
import { getModel } from "../../src/physics/registry.js";
import { pixelPositions, simulateProfile } from "../../src/physics/simulate.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { figureScene } from "../../src/report/render/figureScene.js";
import type { GroupItem, PathItem, Scene, TextItem } from "../../src/report/render/scene.js";
import { sceneToSvg } from "../../src/report/render/svg.js";
import { resultAt } from "../report/figureExamples.js";

const PYTHON = "/usr/bin/python3";
const havePython = spawnSync(PYTHON, ["-c", "import zlib, PIL, numpy"], { stdio: "ignore" }).status === 0;
const haveFonts = figureFontsInstalled("PNG band drawing tests");
if (!havePython) console.warn("SKIPPED: PNG checks against Python's zlib and Pillow (apt-get install python3-pil python3-numpy)");

/** A camera line as B1 has it: 4096 pixels of a two-slit pattern with Poisson noise, "fitted" at the truth. */
function fitFigure4096() {
  const model = getModel("two-slit");
  const truth = { amplitude: 2.0e4, center: 1e-5, separation: 0.5e-3, width: 0.1e-3, visibility: 0.8, phase: 0.1, wavelength: 632.8e-9, distance: 1, background: 150 };
  const x = pixelPositions(4096, 5.5e-6);
  const profile = simulateProfile(model, truth, x, { noise: "poisson", seed: 11 });
  profile.sigma = profile.y.map((v) => Math.sqrt(Math.max(v, 1)));
  return fitFigure(profile, resultAt(model, profile, truth, ["amplitude", "center", "separation", "width", "visibility", "phase", "background"]));
}

function python(script: string, args: string[]): string {
  const run = spawnSync(PYTHON, ["-c", script, ...args], { encoding: "utf8" });
  if (run.status !== 0) throw new Error(run.stderr);
  return run.stdout.trim();
}

describe("planRasterBands(scene, width, height)", () => {
  const scene = figureScene(fitFigure4096());

  it("cuts a fit figure between its data and residual panels, rows covered once, each panel only where it shows", () => {
    const width = 2008, height = Math.round((width * scene.heightMm) / scene.widthMm);
    const bands = planRasterBands(scene, width, height);
    expect(bands.length).toBe(2);
    expect(bands[0]!.rowStart).toBe(0);
    expect(bands[1]!.rowStart).toBe(bands[0]!.rows);
    expect(bands[0]!.rows + bands[1]!.rows).toBe(height);
    // Each band's document draws one panel's markers: data (#7a7a7a) above, residuals (#2b2b2b) below.
    const markers = (svg: string) => [...svg.matchAll(/<path d="([^"]{10000,})"[^>]*stroke="(#[0-9a-f]{6})"[^>]*stroke-linecap="round"/g)].map((m) => m[2]);
    expect(markers(bands[0]!.svg)).toEqual(["#7a7a7a"]);
    expect(markers(bands[1]!.svg)).toEqual(["#2b2b2b"]);
    for (const band of bands) expect(band.svg).toMatch(new RegExp(`^<svg [^>]*width="${width}" height="${band.rows}" viewBox="`));
  });

  it("draws one band when asked for one, or when the figure has a single panel", () => {
    const width = 1000, height = Math.round((width * scene.heightMm) / scene.widthMm);
    expect(planRasterBands(scene, width, height, 1).length).toBe(1);
    const onePanel = { ...scene, items: scene.items.filter((item, i, all) => item.type !== "group" || all.findIndex((it) => it.type === "group") === i) };
    expect(planRasterBands(onePanel, width, height).length).toBe(1);
  });
});

describe("openClips(items, background)", () => {
  const panel = (clip: GroupItem["clip"], bounds: PathItem["bounds"], strokeWidth = 2): GroupItem =>
    ({ type: "group", clip, items: [{ type: "path", d: "M0 0h1", stroke: "#000000", strokeWidth, cap: "round", join: "round", bounds }] });
  const clip = { x: 10, y: 10, width: 100, height: 50 };

  it("opens a panel that reaches 1 px past its clip and frames it with the background: the frame is the clip rectangle widened by the overflow + 1 px", () => {
    const out = openClips([panel(clip, { x0: 10, y0: 10, x1: 110, y1: 60 })], "#ffffff");
    expect(out.map((i) => i.type)).toEqual(["path", "path"]);
    const frame = out[1] as PathItem;
    expect(frame.fill).toBe("#ffffff");
    // stroke 2 px, round: reaches 1 px past the points, frame 2 px wide (hand count)
    expect(frame.d).toBe("M8 8H112V62H8ZM10 10V60H110V10Z");
  });

  it("keeps the clip when the drawing reaches far past it, when bounds are unknown, after a non-panel item, over an earlier panel, or on a transparent background", () => {
    expect(openClips([panel(clip, { x0: -50, y0: 10, x1: 110, y1: 60 })], "#ffffff")[0]!.type).toBe("group");
    expect(openClips([panel(clip, undefined)], "#ffffff")[0]!.type).toBe("group");
    const text: TextItem = { type: "text", x: 0, y: 0, runs: [], size: 10, color: "#000000", anchor: "start" };
    expect(openClips([text, panel(clip, { x0: 20, y0: 20, x1: 30, y1: 30 })], "#ffffff")[1]!.type).toBe("group");
    const below = { x: 10, y: 60.5, width: 100, height: 50 }; // 0.5 px under the first panel: its frame (1 px) would cover it
    expect(openClips([panel(clip, { x0: 20, y0: 20, x1: 30, y1: 30 }), panel(below, { x0: 20, y0: 70, x1: 30, y1: 80 })], "#ffffff").at(-1)!.type).toBe("group");
    expect(openClips([panel(clip, { x0: 20, y0: 20, x1: 30, y1: 30 })], "none")[0]!.type).toBe("group");
  });
});

describe.skipIf(!haveFonts || !havePython)("sceneToPng(scene, dpi) in bands", () => {
  const work = mkdtempSync(path.join(tmpdir(), "fringekit-bands-"));
  afterAll(() => rmSync(work, { recursive: true, force: true }));

  it("gives the pixels of one drawing of the whole figure, in a PNG that zlib and Pillow read", async () => {
    const scene = figureScene(fitFigure4096());
    const [banded, whole] = await Promise.all([sceneToPng(scene, 300, 2), sceneToPng(scene, 300, 1)]);
    const a = decode(banded), b = decode(whole);
    expect([a.width, a.height]).toEqual([b.width, b.height]);
    expect(a.width).toBe(Math.round((scene.widthMm / 25.4) * 300));
    let differing = 0, largest = 0;
    for (let i = 0; i < a.data.length; i++) {
      const d = Math.abs(a.data[i]! - b.data[i]!);
      if (d > 0) differing++;
      largest = Math.max(largest, d);
    }
    // Same geometry and the same rasteriser: at most rounding at the band edge (common practice:
    // anti-aliasing coverage may differ by a level or two where float transforms round differently).
    expect(differing / a.data.length).toBeLessThan(1e-4);
    expect(largest).toBeLessThanOrEqual(8);
    const file = path.join(work, "banded.png");
    writeFileSync(file, banded);
    const report = python(
      `import sys, zlib, struct
from PIL import Image
import numpy as np
data = open(sys.argv[1], "rb").read()
i = data.index(b"IDAT"); n = struct.unpack(">I", data[i-4:i])[0]
raw = zlib.decompress(data[i+4:i+4+n])   # raises on a wrong Adler-32
im = Image.open(sys.argv[1]); im.load()
px = np.asarray(im.convert("RGBA"))
print(len(raw), im.size[0], im.size[1], int(px[..., 0].astype(np.int64).sum()))`,
      [file],
    );
    const [rawLength, w, h, redSum] = report.split(" ").map(Number);
    expect([w, h]).toEqual([a.width, a.height]);
    expect(rawLength).toBe((4 * a.width + 1) * a.height);
    let ours = 0;
    for (let i = 0; i < a.data.length; i += 4) ours += a.data[i]!;
    expect(redSum).toBe(ours);
  });
});

describe.skipIf(!haveFonts)("sceneToPng(scene, dpi) against resvg drawing the SVG file", () => {
  it("gives the pixels resvg draws from the figure's own SVG (clip paths and all), up to antialiasing", async () => {
    const { renderAsync } = await import("@resvg/resvg-js");
    const scene: Scene = figureScene(fitFigure4096());
    const png = decode(await sceneToPng(scene, 300));
    const W = png.width, H = png.height, s = Math.min(W / scene.width, H / scene.height);
    const svg = sceneToSvg(scene, { width: W, height: H, viewBox: [-(W - scene.width * s) / 2 / s, -(H - scene.height * s) / 2 / s, W / s, H / s] });
    expect(svg).toContain("<clipPath");
    const f = figureFonts();
    const reference = (await renderAsync(svg, { fitTo: { mode: "original" }, background: "#ffffff", font: { fontFiles: [f.regular, f.italic], loadSystemFonts: false, defaultFontFamily: "Liberation Sans" }, shapeRendering: 2, textRendering: 1 })).pixels;
    expect(reference.length).toBe(png.data.length);
    let large = 0, largest = 0;
    for (let i = 0; i < reference.length; i++) {
      const d = Math.abs(reference[i]! - png.data[i]!);
      if (d > 8) large++;
      largest = Math.max(largest, d);
    }
    // Edge pixels of the panels and of overlapping dots may differ by a few levels (antialiasing
    // composited in another order); nothing more (common practice for rasteriser comparisons).
    expect(large / reference.length).toBeLessThan(1e-4);
    expect(largest).toBeLessThanOrEqual(40);
  });
});

describe.skipIf(!havePython)("adler32Combine(a, b, lengthB)", () => {
  it("equals zlib's Adler-32 of the joined bytes (Python's zlib.adler32)", () => {
    const cases = [[0, 0], [1, 1], [5552, 65521], [100_000, 3], [70_000, 140_000]];
    const out = python(
      `import sys, zlib, json
for n1, n2 in json.loads(sys.argv[1]):
    a = bytes((i * 31 + 7) % 256 for i in range(n1)); b = bytes((i * 17 + 200) % 256 for i in range(n2))
    print(zlib.adler32(a), zlib.adler32(b), len(b), zlib.adler32(a + b))`,
      [JSON.stringify(cases)],
    );
    for (const line of out.split("\n")) {
      const [a, b, n, joined] = line.split(" ").map(Number);
      expect(adler32Combine(a!, b!, n!)).toBe(joined);
    }
  });
});
