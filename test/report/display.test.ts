import { describe, expect, it } from "vitest";
import { mimeBundleOf } from "../../kernel-ext/display.js";
import { figureFonts } from "../../kernel-ext/figures/fonts.js";
import { displayableFigure } from "../../kernel-ext/figures/figureBundle.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { fitReport } from "../../src/report/tableReport.js";
import { fitExample } from "./figureExamples.js";

/** True when Liberation Sans is installed (Debian fonts-liberation), which figure export needs. */
function hasFonts(): boolean {
  try {
    return Boolean(figureFonts());
  } catch {
    return false;
  }
}

describe("rich display through the kernel's mime-bundle protocol", () => {
  const { profile, result } = fitExample();
  it("mimeBundleOf(fitReport(result)) gives the HTML table, Markdown and text", () => {
    const { data } = mimeBundleOf(fitReport(result));
    expect(data["text/html"]).toMatch(/^<table class="fringekit-table"/);
    expect(data["text/markdown"]).toMatch(/\| Parameter \| Value \|/);
    expect(data["text/plain"]).toMatch(/^Fit of model two-slit/);
  });
  it("mimeBundleOf(fitFigure(...)) gives the plotly JSON; JSON.stringify(figure) stays a plain figure", () => {
    const figure = fitFigure(profile, result);
    const { data } = mimeBundleOf(figure);
    const plotly = data["application/vnd.plotly.v1+json"] as { data: unknown[]; layout: { meta: { kind: string } } };
    expect(plotly.data.length).toBe(4);
    expect(plotly.layout.meta.kind).toBe("fit");
    expect(Object.keys(JSON.parse(JSON.stringify(figure))).sort()).toEqual(["config", "data", "layout"]);
  });
  it.skipIf(!hasFonts())("displayableFigure(figure) adds a static SVG to the bundle", async () => {
    const shown = await displayableFigure(fitFigure(profile, result));
    const { data } = mimeBundleOf(shown);
    expect(data["image/svg+xml"]).toMatch(/<svg[^>]*width="85mm"/);
    expect(data["application/vnd.plotly.v1+json"]).toBeTruthy();
  });
});
