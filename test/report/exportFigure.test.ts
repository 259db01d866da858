import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { figureFontsInstalled } from "../figures/fontsInstalled.js";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { decode } from "fast-png";
import pixelmatch from "pixelmatch";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { exportFigure, FigureRenderer, formatFromPath } from "../../kernel-ext/figures/exportFigure.js";
import { figureScene } from "../../src/report/render/figureScene.js";
import type { SceneItem } from "../../src/report/render/scene.js";
import { exampleFigures } from "./renderExamples.js";

const HERE = path.dirname(fileURLToPath(import.meta.url));
const SNAPSHOTS = path.join(HERE, "snapshots");
/** Snapshots are rendered at 96 dpi (1 CSS px = 1 image px) to keep them small. */
const SNAPSHOT_DPI = 96;
/** Allowed share of differing pixels (anti-aliasing and font hinting vary slightly between runs). */
const MAX_DIFF_SHARE = 0.01;
const haveFonts = figureFontsInstalled("figure export tests");

/** Every text line a scene draws, as plain text, in drawing order. */
function sceneTexts(items: SceneItem[]): string[] {
  return items.flatMap((item) => (item.type === "group" ? sceneTexts(item.items) : item.type === "text" ? [item.runs.map((r) => r.text).join("")] : []));
}

describe.skipIf(!haveFonts)("FigureRenderer (no browser)", () => {
  let renderer: FigureRenderer;
  const work = mkdtempSync(path.join(tmpdir(), "fringekit-figures-"));
  beforeAll(async () => {
    renderer = await FigureRenderer.start();
  });
  afterAll(async () => {
    await renderer?.close();
    rmSync(work, { recursive: true, force: true });
  });

  for (const example of exampleFigures()) {
    const { name, figure, traces } = example;
    it(`figureScene(${name}) draws every legend entry and axis title`, () => {
      const texts = sceneTexts(figureScene(figure).items);
      const legendNames = figure.data.filter((t) => t.showlegend !== false && t.type !== "heatmap").map((t) => String(t.name).replace(/&amp;/g, "&"));
      for (const name of legendNames) expect(texts).toContain(name);
      // The trace names the builder promises are all there (legend or not).
      expect(figure.data.map((t) => t.name)).toEqual(traces);
    });

    it(`render(${name}, "png", {dpi}) has the journal size and matches its snapshot`, async () => {
      const png = await renderer.render(figure, "png", { dpi: SNAPSHOT_DPI });
      const image = decode(png);
      const { widthMm, heightMm } = figure.layout.meta;
      // Pixel size = physical size × dpi (25.4 mm per inch), to within a pixel of rounding.
      expect(Math.abs(image.width - (widthMm / 25.4) * SNAPSHOT_DPI)).toBeLessThanOrEqual(1);
      expect(Math.abs(image.height - (heightMm / 25.4) * SNAPSHOT_DPI)).toBeLessThanOrEqual(1);
      const snapshotFile = path.join(SNAPSHOTS, `figure-${name}.png`);
      if (!existsSync(snapshotFile)) {
        if (process.env.UPDATE_SNAPSHOTS !== "1") throw new Error(`no snapshot ${snapshotFile}; run with UPDATE_SNAPSHOTS=1 once and look at it`);
        mkdirSync(SNAPSHOTS, { recursive: true });
        writeFileSync(snapshotFile, png);
      }
      const expected = decode(readFileSync(snapshotFile));
      expect([image.width, image.height]).toEqual([expected.width, expected.height]);
      const rgba = (img: ReturnType<typeof decode>) => toRgba(img);
      const diff = pixelmatch(rgba(image), rgba(expected), undefined, image.width, image.height, { threshold: 0.1 });
      const share = diff / (image.width * image.height);
      if (share > MAX_DIFF_SHARE) writeFileSync(path.join(work, `figure-${name}.actual.png`), png);
      expect(share, `${diff} pixels differ from ${snapshotFile}`).toBeLessThanOrEqual(MAX_DIFF_SHARE);
    });
  }

  it("render(fit, 'png', {dpi: 300}) scales pixels with the dpi and records it in pHYs", async () => {
    const { figure } = exampleFigures()[0];
    const png = await renderer.render(figure, "png", { dpi: 300 });
    const image = decode(png);
    expect(Math.abs(image.width - (85 / 25.4) * 300)).toBeLessThanOrEqual(2); // 85 mm at 300 dpi ≈ 1004 px
    const phys = Buffer.from(png).indexOf("pHYs");
    expect(phys).toBeGreaterThan(0);
    expect(Buffer.from(png).readUInt32BE(phys + 4)).toBe(Math.round(300 / 0.0254)); // 11811 px/m
  });

  it("render(fit, 'svg') is an SVG sized in mm with a viewBox in CSS px", async () => {
    const { figure } = exampleFigures()[0];
    const svg = new TextDecoder().decode(await renderer.render(figure, "svg"));
    const root = svg.match(/<svg\b[^>]*>/)![0];
    expect(root).toContain('width="85mm"');
    expect(root).toContain('height="70mm"');
    expect(root).toContain(`viewBox="0 0 ${figure.layout.width} ${figure.layout.height}"`);
    expect(svg).toContain("Position");
  });

  it("render(coherence-scan, 'pdf') is a one-page vector PDF of the figure's size", async () => {
    const { figure } = exampleFigures()[2];
    const pdf = Buffer.from(await renderer.render(figure, "pdf"));
    expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
    const text = pdf.toString("latin1");
    const box = text.match(/\/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]/)!;
    // 85 mm = 240.94 pt, 60 mm = 170.08 pt (72 pt per inch, PDF 1.7 ISO 32000-1 §8.3.2.3).
    expect(Math.abs(Number(box[1]) - (85 / 25.4) * 72)).toBeLessThan(0.01);
    expect(Math.abs(Number(box[2]) - (60 / 25.4) * 72)).toBeLessThan(0.01);
    expect(text.match(/\/Type\s*\/Page\b/g)?.length).toBe(1);
    expect(text).not.toMatch(/\/Subtype\s*\/Image/);
    // The font is embedded (a TrueType subset of Liberation Sans), so the PDF prints the same anywhere.
    expect(text).toMatch(/\/FontFile2/);
    expect(text).toMatch(/LiberationSans/);
  });

  it("exportFigure(figure, 'out.pdf') writes atomically and leaves no temporary file", async () => {
    const { figure } = exampleFigures()[3];
    const out = path.join(work, "out.pdf");
    writeFileSync(out, "old");
    const written = await exportFigure(figure, out, {}, renderer);
    expect(written).toMatchObject({ format: "pdf", widthMm: 85, heightMm: 75 });
    expect(readFileSync(out).subarray(0, 5).toString()).toBe("%PDF-");
    expect(readdirSync(work).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });

  it("exportFigure refuses a missing folder and an unknown extension, clearly", async () => {
    const { figure } = exampleFigures()[0];
    await expect(exportFigure(figure, path.join(work, "no", "such", "f.svg"), {}, renderer)).rejects.toThrow(/folder .* does not exist/);
    expect(() => formatFromPath("figure.jpg")).toThrow(/invalid figure file: "figure.jpg" \(a name ending in .svg, .pdf or .png\)/);
    await expect(renderer.render(figure, "png", { dpi: 5000 })).rejects.toThrow(/invalid dpi: 5000/);
  });
});

function toRgba(image: ReturnType<typeof decode>): Uint8Array {
  const { width, height, channels, data } = image;
  if (channels === 4 && data instanceof Uint8Array) return new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  const out = new Uint8Array(width * height * 4);
  for (let i = 0; i < width * height; i++) {
    for (let c = 0; c < 3; c++) out[i * 4 + c] = Number(data[i * channels + Math.min(c, channels - 1)]);
    out[i * 4 + 3] = channels === 4 || channels === 2 ? Number(data[i * channels + channels - 1]) : 255;
  }
  return out;
}

describe.skipIf(!haveFonts)("exportFitReport(profile, result, base, options)", () => {
  it("writes figure, LaTeX, Markdown, HTML and a results file that parses back to the same result", async () => {
    const { parseResults } = await import("../../src/report/results/resultsDocument.js");
    const { exportFitReport } = await import("../../kernel-ext/figures/exportReport.js");
    const { fitExample } = await import("./figureExamples.js");
    const dir = mkdtempSync(path.join(tmpdir(), "fringekit-report-"));
    try {
      const { profile, result } = fitExample();
      const out = await exportFitReport(profile, result, path.join(dir, "fig2"), { formats: ["svg"], fitOptions: { noise: "gaussian" } });
      expect(readdirSync(dir).sort()).toEqual(["fig2-table.tex", "fig2.html", "fig2.json", "fig2.md", "fig2.svg", "fig2.tex"]);
      expect(out.figures).toEqual([path.join(dir, "fig2.svg")]);
      expect(parseResults(readFileSync(out.results, "utf8")).fits[0].result).toEqual(result);
      expect(readFileSync(out.latexDocument, "utf8")).toMatch(/^\\documentclass\{article\}/);
      await expect(exportFitReport(profile, result, path.join(dir, "x.pdf"))).rejects.toThrow(/without extension/);
      const fromFile = { ...profile, provenance: { source: "frame.png", sha256: "0".repeat(64), options: {}, notes: [] } };
      await expect(exportFitReport(fromFile, result, path.join(dir, "frame"))).rejects.toThrow(/frame\.png would replace it/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("exportComparisonReport(profile, fits, base) writes the comparison figure, its table and a results file with every fit", async () => {
    const { parseResults } = await import("../../src/report/results/resultsDocument.js");
    const { exportComparisonReport } = await import("../../kernel-ext/figures/exportReport.js");
    const { comparisonExample } = await import("./figureExamples.js");
    const dir = mkdtempSync(path.join(tmpdir(), "fringekit-report-"));
    try {
      const { profile, fits } = comparisonExample();
      const out = await exportComparisonReport(profile, fits, path.join(dir, "cmp"), { formats: ["pdf"] });
      expect(readdirSync(dir).sort()).toEqual(["cmp-table.tex", "cmp.html", "cmp.json", "cmp.md", "cmp.pdf", "cmp.tex"]);
      expect(readFileSync(path.join(dir, "cmp.pdf")).subarray(0, 5).toString("latin1")).toBe("%PDF-");
      // The table names both models it was given, and the results file holds both fits.
      const markdown = readFileSync(out.markdown, "utf8").replace(/\\(.)/g, "$1"); // Markdown escapes (CommonMark §2.4) removed
      for (const { label } of fits) expect(markdown).toContain(label);
      expect(parseResults(readFileSync(out.results, "utf8")).fits.map((f: { result: unknown }) => f.result)).toEqual(fits.map((f) => f.result));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
