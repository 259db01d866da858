// The figure renderer (src/report/render): markup, ticks, colours, compact paths and the SVG
// it writes for the builders' figures.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { parseColor, scaleColor } from "../../src/report/render/color.js";
import { figureScene, simplifyPolyline } from "../../src/report/render/figureScene.js";
import { figureSvg } from "../../src/report/render/figureSvg.js";
import { parseMarkup, textWidth } from "../../src/report/render/markup.js";
import { PathBuilder, type SceneItem } from "../../src/report/render/scene.js";
import { autoTicks, tickLabel } from "../../src/report/render/ticks.js";
import { b1Profile, fitB1 } from "../../bench/B1.js";
import { fitExample } from "./figureExamples.js";
import { exampleFigures } from "./renderExamples.js";

const PYTHON = "/usr/bin/python3";

describe("parseMarkup(text)", () => {
  it("parseMarkup('Intensity <i>I</i> (10<sup>3</sup> counts)') gives italic and superscript runs", () => {
    expect(parseMarkup("Intensity <i>I</i> (10<sup>3</sup> counts)")).toEqual([
      { text: "Intensity ", italic: false, shift: null },
      { text: "I", italic: true, shift: null },
      { text: " (10", italic: false, shift: null },
      { text: "3", italic: false, shift: "sup" },
      { text: " counts)", italic: false, shift: null },
    ]);
  });
  it("parseMarkup decodes entities (HTML 5 named and numeric references) and drops unknown tags", () => {
    expect(parseMarkup("a &amp; b &lt;c&gt; &#963; &#x3c7; <span>x</span>").map((r) => r.text).join("")).toBe("a & b <c> σ χ x");
  });
  it("textWidth('10', 10) is two digit advances of Liberation Sans (556/1000 em each, from the font's hmtx table)", () => {
    expect(textWidth("10", 10)).toBeCloseTo(11.12, 10);
  });
});

describe("autoTicks(low, high, target) and tickLabel(value, step)", () => {
  it("autoTicks(-5.63, 5.63, 5) steps by 5 (1-2-5 series, common practice)", () => {
    expect(autoTicks(-5.63, 5.63, 5)).toEqual({ values: [-5, 0, 5], step: 5 });
  });
  it("autoTicks(0.8374, 0.8626, 5) steps by 0.01 and keeps ticks inside the range", () => {
    const { values, step } = autoTicks(0.8374, 0.8626, 5);
    expect(step).toBeCloseTo(0.01, 15);
    expect(values).toEqual([0.84, 0.85, 0.86]);
  });
  it("tickLabel uses the step's decimals, drops trailing zeros and writes a true minus (U+2212)", () => {
    expect([tickLabel(-0.5, 0.5), tickLabel(1, 0.5), tickLabel(1.5, 0.5), tickLabel(-0, 1), tickLabel(0.86, 0.01)]).toEqual(["−0.5", "1", "1.5", "0", "0.86"]);
  });
});

describe("parseColor(css) and scaleColor(scale, t)", () => {
  it("parseColor reads #rgb, #rrggbb and rgba() (CSS Color Module Level 3)", () => {
    expect(parseColor("#abc")).toEqual({ hex: "#aabbcc", alpha: 1 });
    expect(parseColor("rgba(20, 61, 115, 0.18)")).toEqual({ hex: "#143d73", alpha: 0.18 });
    expect(parseColor("nonsense").alpha).toBe(0);
  });
  it("scaleColor halfway between #000000 and #ffffff is #808080 (linear in sRGB components, 127.5 rounds up; hand count)", () => {
    expect(scaleColor([[0, "#000000"], [1, "#ffffff"]], 0.5)).toBe("#808080");
    expect(scaleColor([[0, "#143d73"], [0.5, "#f4f4f4"], [1, "#74280e"]], 1)).toBe("#74280e");
  });
});

describe("PathBuilder", () => {
  it("writes coordinates rounded to 0.1 px, relative after the first point", () => {
    const d = new PathBuilder().move(10.04, 20.06).line(12.5, 20.06).line(12.5, 18).dot(0.55, -1).toString();
    // (0.55, −1) rounds to (0.6, −1): a move of (−11.9, −19) from (12.5, 18) (hand count).
    expect(d).toBe("M10 20.1h2.5v-2.1m-11.9-19h0");
  });

  it("writes negative and sub-unit steps without a leading zero and sums relative steps exactly", () => {
    // 0.1 px steps 30 times from 0.05 (rounds to 0.1): ends at 3.1 px (hand count), each step "h.1".
    const p = new PathBuilder().move(0.05, -0.04);
    for (let i = 1; i <= 30; i++) p.line(0.05 + i * 0.1, -0.04);
    p.line(-1.25, -0.55);
    const d = p.toString();
    expect(d.startsWith("M.1 0h.1h.1")).toBe(true);
    // From (3.1, 0) to (−1.25, −0.55) → (−1.2 or −1.3, −0.6 or −0.5): Math.round rounds halves up, to (−1.2, −0.5).
    expect(d.endsWith("h.1l-4.3-.5")).toBe(true);
  });
});

/** Distance (px) from point p to the segment a–b (plane geometry, written out independently of the renderer). */
function segmentDistance(p: [number, number], a: [number, number], b: [number, number]): number {
  const dx = b[0] - a[0], dy = b[1] - a[1], L2 = dx * dx + dy * dy;
  const t = L2 === 0 ? 0 : Math.min(1, Math.max(0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / L2));
  return Math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy);
}

describe("simplifyPolyline(points, tolerance)", () => {
  it("keeps only the ends of a straight run, and every corner of a zigzag larger than the tolerance", () => {
    const straight = Array.from({ length: 50 }, (_, i) => [i * 0.3, 2 + i * 0.1] as [number, number]);
    expect(simplifyPolyline(straight, 0.02)).toEqual([straight[0], straight[49]]);
    const zigzag = Array.from({ length: 9 }, (_, i) => [i, i % 2 ? 1 : 0] as [number, number]);
    expect(simplifyPolyline(zigzag, 0.02)).toEqual(zigzag);
  });

  it("leaves every dropped vertex of a 4096-point fringe curve within the tolerance of the line drawn, keeping order", () => {
    // cos² fringes under a sinc² envelope sampled as B1's model (4096 points over 280 px), plus a spike that doubles back.
    const points = Array.from({ length: 4096 }, (_, i) => {
      const u = (i - 2048) / 2048, s = Math.abs(u) < 1e-12 ? 1 : Math.sin(3 * u) / (3 * u);
      return [35 + i * (280 / 4095), 170 - 140 * s * s * Math.cos(14 * Math.PI * u) ** 2] as [number, number];
    });
    points[1000] = [points[1000]![0] - 3, points[1000]![1]];
    const kept = simplifyPolyline(points, 0.02);
    expect(kept.length).toBeLessThan(points.length / 3);
    expect(kept).toContainEqual(points[1000]);
    const at = kept.map((p) => points.indexOf(p));
    expect(at[0]).toBe(0);
    expect(at.at(-1)).toBe(points.length - 1);
    for (let k = 1; k < at.length; k++) {
      expect(at[k]).toBeGreaterThan(at[k - 1]!);
      for (let i = at[k - 1]! + 1; i < at[k]!; i++) expect(segmentDistance(points[i]!, kept[k - 1]!, kept[k]!)).toBeLessThanOrEqual(0.02 + 1e-12);
    }
  });
});

/** Text lines of a scene with their baselines (px). */
function textLines(items: SceneItem[]): { text: string; y: number; size: number }[] {
  return items.flatMap((item) => (item.type === "group" ? textLines(item.items) : item.type === "text" ? [{ text: item.runs.map((r) => r.text).join(""), y: item.y, size: item.size }] : []));
}

describe("figureScene(figure) legend", () => {
  it("figureScene(fit figure whose legend wraps to two rows) keeps the legend inside the figure", () => {
    const { profile, result } = fitExample(); // has excluded points: three legend entries
    const figure = fitFigure(profile, result, { dataLabel: "Å données µ±σ", modelLabel: "fit – λ/2" });
    const scene = figureScene(figure);
    const legend = textLines(scene.items).filter((t) => ["Å données µ±σ", "fit – λ/2", "excluded"].includes(t.text));
    expect(legend.length).toBe(3);
    // Two rows: two baselines. A text's top is about one font size above its baseline (common practice).
    expect(new Set(legend.map((t) => t.y)).size).toBe(2);
    for (const t of legend) expect(t.y - t.size).toBeGreaterThanOrEqual(0);
  });
});

function paths(items: SceneItem[]): number {
  return items.reduce((n, item) => n + (item.type === "group" ? paths(item.items) : item.type === "path" ? 1 : 0), 0);
}

describe("figureSvg(figure)", () => {
  it("figureSvg(fitFigure of B1's 4096-point fit) is at most 200 KB, one path per trace, sized in mm", () => {
    const profile = b1Profile(1);
    const result = fitB1(profile, "poisson");
    const figure = fitFigure(profile, result);
    const svg = figureSvg(figure);
    expect(svg.length).toBeLessThanOrEqual(200 * 1024); // issue 14's size goal for this figure
    expect(svg).toMatch(/<svg\b[^>]*width="85mm" height="70mm" viewBox="0 0 321 265"/);
    // Three traces (data, model, residuals) draw three paths; axes, ticks, legend and guide add the rest.
    const scene = figureScene(figure);
    const traceGroups = scene.items.filter((i) => i.type === "group");
    expect(traceGroups.map((g) => (g.type === "group" ? paths(g.items) : 0))).toEqual([2, 1]);
  });

  it("every example figure is well-formed XML with text as text (parsed by Python's xml.etree)", () => {
    if (!existsSync(PYTHON)) {
      console.warn("SKIPPED: XML check (no /usr/bin/python3)");
      return;
    }
    for (const { name, figure } of exampleFigures()) {
      const svg = figureSvg(figure);
      const run = spawnSync(PYTHON, ["-c", "import sys, xml.etree.ElementTree as E; r = E.fromstring(sys.stdin.buffer.read()); print(sum(1 for e in r.iter() if e.tag.endswith('text')))"], { input: svg, encoding: "utf8" });
      expect(run.status, `${name}: ${run.stderr}`).toBe(0);
      expect(Number(run.stdout), name).toBeGreaterThan(5);
    }
  });
});
