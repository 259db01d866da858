/**
 * Several models fitted to the same profile, overlaid on the data, with each model's
 * normalised residuals in the panel below (one colour, dash and marker per model).
 */
import { InvalidArgumentError } from "../../errors.js";
import { residualAxisTitle, residualScale } from "../../fit/residualScale.js";
import type { Profile } from "../../profile.js";
import { plainArray, plotlyText, STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import { residualPanelAxes, symmetricLimit, type FitCurves } from "./fitFigure.js";
import { baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { seriesStyle } from "./palette.js";
import { profileTraces } from "./profileTraces.js";

/**
 * Comparison figure of up to four fits (more would not stay readable in print).
 * Default size: double column (180 mm) × 80 mm.
 * @param profile the profile all fits were made to (x in m)
 * @param fits    labelled FitResults of that profile (a LabelledFit, or any label with FitCurves)
 */
export function comparisonFigure(profile: Profile, fits: readonly { label: string; result: FitCurves }[], options: FigureSize = {}): FigureSpec {
  if (!Array.isArray(fits) || fits.length < 1 || fits.length > 4) {
    throw new InvalidArgumentError("fits", Array.isArray(fits) ? `${fits.length} fits` : fits, "1 to 4 labelled fits of the same profile");
  }
  for (const f of fits) {
    if (f.result.model.length !== profile.x.length) {
      throw new InvalidArgumentError("fits", f.label, `fits of this profile (${profile.x.length} points), not of another one`);
    }
  }
  const size = resolveSize(options, 80, "double");
  const points = profileTraces(profile);
  const axis = points.xAxis;
  const yAxis = points.yAxis;
  const data: Record<string, unknown>[] = [...points.traces];
  let limit = 3;
  fits.forEach((f, i) => {
    const style = seriesStyle(i);
    // All points, NaN (→ gap) where masked, so the residual line breaks over excluded regions.
    const residuals = plainArray(f.result.residuals);
    limit = Math.max(limit, symmetricLimit(residuals));
    data.push({
      type: "scatter", mode: "lines", name: plotlyText(f.label), legendgroup: `m${i}`,
      x: plainArray(profile.x, axis.scale), y: plainArray(f.result.model, yAxis.scale),
      line: { color: style.color, width: 1.2, dash: style.dash }, xaxis: "x", yaxis: "y",
    });
    data.push({
      type: "scatter", mode: "lines", name: `${plotlyText(f.label)} residuals`, legendgroup: `m${i}`, showlegend: false,
      x: plainArray(profile.x, axis.scale), y: residuals,
      line: { color: style.color, width: 0.8, dash: style.dash }, xaxis: "x2", yaxis: "y2",
    });
  });
  const layout = {
    ...baseLayout(size, { kind: "comparison", models: fits.map((f) => f.result.modelId), xUnit: axis.unit }),
    ...residualPanelAxes(axis.title, yAxis.title, limit, { dataFrom: 0.36, residualsTo: 0.28, residualTicks: 5 },
      residualAxisTitle(residualScale(fits[0].result.noise ?? "auto", profile.sigma !== undefined, profile.counts))),
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}
