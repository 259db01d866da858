/**
 * The PDF writer checked from outside: MuPDF (`mutool`, Debian mupdf-tools) draws the PDF and
 * extracts its text, fontTools (Debian python3-fonttools, a dependency of python3-matplotlib)
 * reads the embedded font subsets and compares them with the original font files.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { inflateSync } from "node:zlib";
import { decode } from "fast-png";
import pixelmatch from "pixelmatch";
import { afterAll, describe, expect, it } from "vitest";
import { FigureRenderer } from "../../kernel-ext/figures/exportFigure.js";
import { figureFonts } from "../../kernel-ext/figures/fonts.js";
import { pathOperators } from "../../kernel-ext/figures/pdfScene.js";
import { parseTrueType } from "../../kernel-ext/figures/trueType.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { figureScene } from "../../src/report/render/figureScene.js";
import type { SceneItem } from "../../src/report/render/scene.js";
import { fitExample } from "../report/figureExamples.js";
import { exampleFigures } from "../report/renderExamples.js";

const PYTHON = "/usr/bin/python3";
const haveFonts = (() => {
  try {
    return Boolean(figureFonts());
  } catch {
    return false;
  }
})();
const haveMutool = spawnSync("mutool", ["-v"], { encoding: "utf8" }).error === undefined;
const haveFontTools = spawnSync(PYTHON, ["-c", "import fontTools"], { stdio: "ignore" }).status === 0;
if (!haveFonts) console.warn("SKIPPED: PDF writer tests (Debian fonts-liberation not installed)");
else if (!haveMutool) console.warn("SKIPPED: PDF drawn and read by MuPDF (install Debian's mupdf-tools)");
if (haveFonts && !haveFontTools) console.warn("SKIPPED: embedded font subsets read by fontTools (install Debian's python3-fonttools)");

describe("pathOperators(d)", () => {
  it("pathOperators(relative and absolute M, L, H, V, Z) gives absolute PDF operators in tenths of a px", () => {
    // SVG 1.1 §8.3 (W3C): lower case is relative to the current point, pairs after a moveto
    // are linetos, closepath returns the current point to the subpath's start.
    expect(pathOperators("M10 20h5v-2.5l1.5.5z m-3 1h0").trim().split("\n")).toEqual([
      "100 200 m", "150 200 l", "150 175 l", "165 180 l", "h", "70 210 m", "70 210 l",
    ]);
    expect(pathOperators("M1,2 3,4 L5 6 7 8").trim().split("\n")).toEqual(["10 20 m", "30 40 l", "50 60 l", "70 80 l"]);
  });

  it("pathOperators(malformed or curved path) stops where an SVG renderer stops drawing", () => {
    // SVG 1.1 §F.6 (error processing): render the path up to the segment in error.
    expect(pathOperators("M1 1L2 2C3 3 4 4 5 5L6 6").trim().split("\n")).toEqual(["10 10 m", "20 20 l"]);
    expect(pathOperators("M1 1L2").trim().split("\n")).toEqual(["10 10 m"]);
  });
});

/** Every text run a scene draws. */
function sceneRuns(items: SceneItem[]): string[] {
  return items.flatMap((item) => (item.type === "group" ? sceneRuns(item.items) : item.type === "text" ? item.runs.map((r) => r.text) : []));
}

describe.skipIf(!haveFonts)("sceneToPdf(scene)", () => {
  const work = mkdtempSync(path.join(tmpdir(), "fringekit-pdf-"));
  afterAll(() => rmSync(work, { recursive: true, force: true }));
  const renderer = new FigureRenderer();
  const { profile, result } = fitExample();
  // Composite glyphs (Å, é) and non-Latin characters in user text, beside the usual labels.
  const special = fitFigure(profile, result, { dataLabel: "Å é µ±σ", modelLabel: "fit – λ/2" });
  const figures = [...exampleFigures(), { name: "special-text", figure: special }];

  for (const { name, figure } of figures) {
    it.skipIf(!haveMutool)(`render(${name}, "pdf") drawn by MuPDF matches resvg's PNG of the same figure`, async () => {
      const pdfFile = path.join(work, `${name}.pdf`);
      writeFileSync(pdfFile, await renderer.render(figure, "pdf"));
      const drawn = path.join(work, `${name}.mupdf.png`);
      const run = spawnSync("mutool", ["draw", "-q", "-r", "96", "-c", "rgba", "-o", drawn, pdfFile, "1"], { encoding: "utf8" });
      expect(run.status, run.stderr).toBe(0);
      const a = decode(readFileSync(drawn));
      const b = decode(await renderer.render(figure, "png", { dpi: 96 }));
      expect(Math.abs(a.width - b.width)).toBeLessThanOrEqual(1);
      expect(Math.abs(a.height - b.height)).toBeLessThanOrEqual(1);
      const w = Math.min(a.width, b.width), h = Math.min(a.height, b.height);
      const crop = (img: ReturnType<typeof decode>) => {
        const out = new Uint8ClampedArray(w * h * 4);
        const ch = img.channels;
        for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) for (let c = 0; c < 4; c++) out[(y * w + x) * 4 + c] = c < ch ? Number(img.data[(y * img.width + x) * ch + c]) : 255;
        return out;
      };
      const diff = pixelmatch(crop(a), crop(b), undefined, w, h, { threshold: 0.2 });
      // Two rasterisers anti-alias and hint text differently; a misplaced label or a missing trace differs by far more.
      expect(diff / (w * h)).toBeLessThanOrEqual(0.02);
    });

    it.skipIf(!haveMutool)(`render(${name}, "pdf") text as MuPDF extracts it holds every text run of the figure`, async () => {
      const pdfFile = path.join(work, `${name}-text.pdf`);
      writeFileSync(pdfFile, await renderer.render(figure, "pdf"));
      const run = spawnSync("mutool", ["draw", "-q", "-F", "txt", pdfFile, "1"], { encoding: "utf8" });
      expect(run.status, run.stderr).toBe(0);
      const text = run.stdout.replace(/\s+/g, "");
      for (const r of sceneRuns(figureScene(figure).items)) expect(text).toContain(r.replace(/\s+/g, ""));
    });
  }

  it.skipIf(!haveFontTools)("render(figure, 'pdf') embeds subsets whose glyphs and widths are the font's own (read by fontTools)", async () => {
    const pdf = Buffer.from(await renderer.render(special, "pdf"));
    const text = pdf.toString("latin1");
    // Streams in file order: per face the font file (/Length1), then its ToUnicode map; the widths in the CIDFont dictionary.
    const streams = [...text.matchAll(/<<([^>]*?)>>\nstream\n/g)].map((m) => {
      const start = m.index! + m[0].length;
      const length = Number(/\/Length (\d+)/.exec(m[1]!)![1]);
      return { dict: m[1]!, data: inflateSync(pdf.subarray(start, start + length)) };
    });
    const fontFiles = streams.filter((s) => s.dict.includes("/Length1"));
    const toUnicode = streams.filter((s) => s.data.includes("beginbfchar")).map((s) => s.data.toString("latin1"));
    const widths = [...text.matchAll(/\/W \[(.*?)\] \/CIDToGIDMap/g)].map((m) => [...m[1]!.matchAll(/(\d+) \[(\d+)\]/g)].map((w) => [Number(w[1]), Number(w[2])]));
    const names = [...text.matchAll(/\/BaseFont \/([A-Z]{6})\+(\S+) \/Encoding/g)].map((m) => m[2]);
    expect(names).toEqual(["LiberationSans", "LiberationSans-Italic"]);
    expect(fontFiles.length).toBe(2);
    const files = figureFonts();
    const cases = names.map((face, i) => {
      const subset = path.join(work, `subset-${i}.ttf`);
      writeFileSync(subset, fontFiles[i]!.data);
      const chars = [...toUnicode[i]!.slice(toUnicode[i]!.indexOf("beginbfchar")).matchAll(/<([0-9a-f]{4})> <([0-9a-f]{4})>/g)].map((m) => [parseInt(m[1]!, 16), parseInt(m[2]!, 16)]);
      return { subset, original: face === "LiberationSans" ? files.regular : files.italic, chars, widths: widths[i] };
    });
    // For each character: the subset glyph's outline (components resolved) and advance equal
    // the original font's glyph for that character, and the PDF width is advance × 1000 / em.
    const script = [
      "import json, sys",
      "from fontTools.ttLib import TTFont",
      "from fontTools.pens.recordingPen import DecomposingRecordingPen",
      "out = []",
      "for case in json.load(sys.stdin):",
      "    sub, orig = TTFont(case['subset']), TTFont(case['original'])",
      "    sub_order, cmap = sub.getGlyphOrder(), orig.getBestCmap()",
      "    def outline(font, name):",
      "        pen = DecomposingRecordingPen(font.getGlyphSet()); font.getGlyphSet()[name].draw(pen); return pen.value",
      "    upm = orig['head'].unitsPerEm",
      "    w = dict(case['widths'])",
      "    for gid, ch in case['chars']:",
      "        name = cmap[ch]",
      "        same_outline = outline(sub, sub_order[gid]) == outline(orig, name)",
      "        same_advance = sub['hmtx'][sub_order[gid]][0] == orig['hmtx'][name][0]",
      "        width_ok = w.get(gid) == round(orig['hmtx'][name][0] * 1000 / upm)",
      "        out.append([chr(ch), same_outline, same_advance, width_ok])",
      "print(json.dumps(out))",
    ].join("\n");
    const run = spawnSync(PYTHON, ["-c", script], { input: JSON.stringify(cases), encoding: "utf8" });
    expect(run.status, run.stderr).toBe(0);
    const results = JSON.parse(run.stdout) as [string, boolean, boolean, boolean][];
    const chars = results.map((r) => r[0]).join("");
    for (const ch of "Åéµ±σ–λ") expect(chars).toContain(ch);
    for (const r of results) expect(r, `glyph of ${JSON.stringify(r[0])}`).toEqual([r[0], true, true, true]);
  });
});
