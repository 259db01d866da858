/**
 * The comparison figure that shows what tells models apart: data with every model curve on top,
 * and below, per model, the binned normalised residuals z = Σr/√m (see binResiduals) with the
 * ±2 band a good model stays in — runs outside it mark where a model misses the data.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { Profile } from "../../profile.js";
import { binResiduals } from "./binnedResiduals.js";
import { plainArray, plotlyText, STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import type { FitCurves } from "./fitFigure.js";
import { axisStyle, baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { GUIDE, seriesStyle } from "./palette.js";
import { profileTraces } from "./profileTraces.js";
import { symmetricTicks } from "./axes.js";

/** Options of modelDifferenceFigure: size (mm), font (pt) and the number of residual bins. */
export interface ModelDifferenceFigureOptions extends FigureSize {
  /** Residual bins along the line (default one per 25 used points, 8 to 60). */
  bins?: number;
}

/**
 * Figure of 1–4 fits of one profile: data and model curves, and binned residuals per model.
 * Default size: double column (180 mm) × 90 mm.
 * @param profile the profile all fits were made to (x in m)
 * @param fits    labelled fits of that profile
 */
export function modelDifferenceFigure(profile: Profile, fits: readonly { label: string; result: FitCurves }[], options: ModelDifferenceFigureOptions = {}): FigureSpec {
  if (!Array.isArray(fits) || fits.length < 1 || fits.length > 4) {
    throw new InvalidArgumentError("fits", Array.isArray(fits) ? `${fits.length} fits` : fits, "1 to 4 labelled fits of the same profile");
  }
  for (const f of fits) {
    if (f.result.model.length !== profile.x.length) throw new InvalidArgumentError("fits", f.label, `fits of this profile (${profile.x.length} points), not of another one`);
  }
  const size = resolveSize(options, 90, "double");
  const points = profileTraces(profile);
  const axis = points.xAxis;
  const data: Record<string, unknown>[] = [...points.traces];
  let limit = 3;
  fits.forEach((f, i) => {
    const style = seriesStyle(i);
    const binned = binResiduals(profile, f.result.residuals, options.bins);
    for (const z of binned.z) limit = Math.max(limit, Math.ceil(Math.abs(z) * 1.1));
    data.push({
      type: "scatter", mode: "lines", name: plotlyText(f.label), legendgroup: `m${i}`,
      x: plainArray(profile.x, axis.scale), y: plainArray(f.result.model, points.yAxis.scale),
      line: { color: style.color, width: 1.2, dash: style.dash }, xaxis: "x", yaxis: "y",
    });
    data.push({
      type: "scatter", mode: "lines+markers", name: `${plotlyText(f.label)} binned residuals`, legendgroup: `m${i}`, showlegend: false,
      x: plainArray(binned.x, axis.scale), y: plainArray(binned.z),
      line: { color: style.color, width: 1, dash: style.dash }, marker: { color: style.color, size: 4, symbol: style.marker },
      xaxis: "x2", yaxis: "y2",
    });
  });
  const band = (y: number) => ({ type: "line", xref: "x2 domain", x0: 0, x1: 1, yref: "y2", y0: y, y1: y, line: { color: GUIDE, width: 0.6, dash: "dot" } });
  const layout = {
    ...baseLayout(size, { kind: "comparison", models: fits.map((f) => f.result.modelId), xUnit: axis.unit, residuals: "binned" }),
    xaxis: axisStyle("", { domain: [0, 1], anchor: "y", matches: "x2", showticklabels: false, title: undefined }),
    yaxis: axisStyle(points.yAxis.title, { domain: [0.5, 1], anchor: "x", rangemode: "tozero" }),
    xaxis2: axisStyle(axis.title, { domain: [0, 1], anchor: "y2" }),
    yaxis2: axisStyle("binned Σ(<i>I</i>−<i>f</i>)/<i>σ</i> / √<i>m</i>", {
      domain: [0, 0.42], anchor: "x2", range: [-limit, limit], tickmode: "array", tickvals: symmetricTicks(limit, 5),
    }),
    shapes: [{ ...band(0), line: { color: GUIDE, width: 0.75 } }, band(2), band(-2)],
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}
