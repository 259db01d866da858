import { describe, expect, it } from "vitest";
import { intensityAxis, symmetricTicks, unitInTitle } from "../../src/report/figures/axes.js";
import { coherenceScanFigure } from "../../src/report/figures/coherenceScanFigure.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { resolveSize } from "../../src/report/figures/journal.js";
import { legendWhereFree } from "../../src/report/figures/legendPlacement.js";
import { coherenceExample, fitExample } from "./figureExamples.js";

describe("unitInTitle(unit) and intensityAxis(values, unit)", () => {
  it.each([
    ["counts (row mean)", "counts, row mean"],
    ["counts/s [dark subtracted]", "counts/s, dark subtracted"],
    ["(a.u.)", "a.u."],
    ["counts", "counts"],
    ["mW/m^2", "mW/m^2"],
  ])("unitInTitle(%j) is %j", (unit, expected) => {
    expect(unitInTitle(unit)).toBe(expected);
  });

  it("intensityAxis([2e4], 'counts (row mean)') reads 'Intensity I (10³ counts, row mean)', one pair of brackets", () => {
    // Axis titles read "quantity symbol (unit)" with a single pair of brackets (common practice).
    const { title } = intensityAxis([2e4], "counts (row mean)");
    expect(title).toBe("Intensity <i>I</i> (10<sup>3</sup> counts, row mean)");
    expect(title.match(/\(/g)).toHaveLength(1);
  });
});

describe("symmetricTicks(limit, maxTicks)", () => {
  it("symmetricTicks gives at least three ticks, symmetric about 0 and inside ±limit, for limits 0.1–1000", () => {
    for (let limit = 0.1; limit < 1000; limit *= 1.07) {
      for (const maxTicks of [3, 4, 5, 7]) {
        const ticks = symmetricTicks(limit, maxTicks);
        const where = `limit ${limit}, maxTicks ${maxTicks}: ${ticks.join(" ")}`;
        expect(ticks.length, where).toBeGreaterThanOrEqual(3);
        expect(ticks.includes(0), where).toBe(true);
        expect(ticks.map((t) => -t + 0).reverse(), where).toEqual(ticks.map((t) => t + 0));
        expect(Math.max(...ticks), where).toBeLessThanOrEqual(limit * (1 + 1e-9));
      }
    }
  });

  it("symmetricTicks(3, 4) is −2, 0, 2; (5, 4) is −5, 0, 5; (22, 5) is −20 … 20 in steps of 10 (1-2-5 steps, common practice)", () => {
    expect(symmetricTicks(3, 4)).toEqual([-2, 0, 2]);
    expect(symmetricTicks(5, 4)).toEqual([-5, 0, 5]);
    expect(symmetricTicks(22, 5)).toEqual([-20, -10, 0, 10, 20]);
  });

  it("fitFigure puts explicit symmetric ticks on the residual axis, never a lone 0", () => {
    const { profile, result } = fitExample();
    const quiet = { ...result, residuals: result.residuals.map((r) => r * 0.01) };
    for (const r of [result, quiet]) {
      const axis = fitFigure(profile, r).layout.yaxis2 as { tickvals: number[]; range: [number, number] };
      expect(axis.tickvals.length).toBeGreaterThanOrEqual(3);
      expect(axis.tickvals[0]).toBe(-axis.tickvals[axis.tickvals.length - 1]!);
      expect(axis.tickvals[0]).toBeGreaterThanOrEqual(axis.range[0]);
    }
  });
});

describe("legendWhereFree(data, xRange, yRange, size)", () => {
  const size = resolveSize({}, 60);
  const line = (x: number[], y: number[], name: string) => ({ type: "scatter", mode: "lines", x, y, name });

  it("legendWhereFree puts the legend in the first corner no trace passes through", () => {
    // A falling curve through the top left and bottom right: the top right is free.
    const xs = Array.from({ length: 50 }, (_, i) => i / 49);
    const falling = line(xs, xs.map((x) => 1 - x), "fit");
    expect(legendWhereFree([falling], [0, 1], [0, 1], size)).toMatchObject({ orientation: "v", x: 1, xanchor: "right", y: 1, yanchor: "top" });
    // A flat line across the top: the bottom corners are free, the right one first.
    const top = line(xs, xs.map(() => 0.95), "fit");
    expect(legendWhereFree([top], [0, 1], [0, 1], size)).toMatchObject({ x: 1, y: 0, yanchor: "bottom" });
  });

  it("legendWhereFree falls back to one row above the plot when every corner holds data", () => {
    const xs = Array.from({ length: 50 }, (_, i) => i / 49);
    const rows = [0.02, 0.98].map((y) => line(xs, xs.map(() => y), `y = ${y}`));
    expect(legendWhereFree(rows, [0, 1], [0, 1], size)).toMatchObject({ orientation: "h", y: 1, yanchor: "bottom" });
  });

  it("coherenceScanFigure's legend box holds none of its curve, band or error-bar points", () => {
    const { scan, result, model } = coherenceExample();
    const fig = coherenceScanFigure(scan, result, model);
    const legend = fig.layout.legend as { orientation: string; x: number; y: number };
    const xRange = (fig.layout.xaxis as { range: [number, number] }).range;
    const yRange = (fig.layout.yaxis as { range: [number, number] }).range;
    // The rendered legend (150 dpi example, docs/img/figure-coherence-scan.png) spans about half
    // the plot width and 28 % of its height: no point of any trace may lie in that box.
    expect(legend.orientation).toBe("v");
    const fx = (x: number) => (x - xRange[0]) / (xRange[1] - xRange[0]), fy = (y: number) => (y - yRange[0]) / (yRange[1] - yRange[0]);
    const inBox = (x: number, y: number) => (legend.x === 1 ? fx(x) > 0.5 : fx(x) < 0.5) && (legend.y === 1 ? fy(y) > 0.72 : fy(y) < 0.28);
    for (const trace of fig.data) {
      const xs = trace.x as number[], ys = trace.y as (number | null)[];
      const errors = (trace.error_y as { array?: number[] } | undefined)?.array;
      ys.forEach((y, i) => {
        if (y === null) return;
        for (const v of [y, y + (errors?.[i] ?? 0), y - (errors?.[i] ?? 0)]) expect(inBox(xs[i]!, v), `${String(trace.name)} at ${xs[i]}, ${v}`).toBe(false);
      });
    }
    for (const trace of fig.data) {
      for (const y of trace.y as (number | null)[]) if (y !== null) expect(y).toBeLessThanOrEqual(yRange[1]);
    }
  });
});
