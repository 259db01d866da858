/**
 * The example figures of every kind, and a script that renders them as PNG for the README:
 *   npx tsx test/report/renderExamples.ts docs/img        (writes docs/img/figure-<kind>.png)
 */
import path from "node:path";
import { pathToFileURL } from "node:url";
import { exportFigure, FigureRenderer } from "../../kernel-ext/figures/exportFigure.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { coherenceScanFigure } from "../../src/report/figures/coherenceScanFigure.js";
import { comparisonFigure } from "../../src/report/figures/comparisonFigure.js";
import { correlationFigure } from "../../src/report/figures/correlationFigure.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { profileLikelihoodFigure } from "../../src/report/figures/profileLikelihoodFigure.js";
import { coherenceExample, comparisonExample, fitExample, profileCurvesExample } from "./figureExamples.js";

/** One example per figure kind, with the trace names each must contain. */
export function exampleFigures(): { name: string; figure: FigureSpec; traces: string[] }[] {
  const fit = fitExample();
  const comparison = comparisonExample();
  const coherence = coherenceExample();
  return [
    { name: "fit", figure: fitFigure(fit.profile, fit.result), traces: ["data", "excluded", "two-slit fit", "residuals"] },
    {
      name: "comparison", figure: comparisonFigure(comparison.profile, comparison.fits),
      traces: ["data", "excluded", "far field, V free", "far field, V free residuals", "far field, V = 0.80", "far field, V = 0.80 residuals"],
    },
    {
      name: "coherence-scan", figure: coherenceScanFigure(coherence.scan, coherence.result, coherence.model),
      traces: ["band lower", "95 % confidence band", "coherence-disc fit", "measured"],
    },
    { name: "correlation", figure: correlationFigure(fit.result), traces: ["correlation"] },
    { name: "profile-likelihood", figure: profileLikelihoodFigure(profileCurvesExample()), traces: ["profile", "quadratic (covariance)", "profile", "quadratic (covariance)"] },
  ];
}

async function main(outDir: string, dpi: number): Promise<void> {
  const renderer = await FigureRenderer.start();
  try {
    for (const { name, figure } of exampleFigures()) {
      const written = await exportFigure(figure, path.join(outDir, `figure-${name}.png`), { dpi }, renderer);
      console.log(`${written.path}: ${written.widthPx} × ${written.heightPx} px (${written.widthMm} × ${written.heightMm} mm at ${dpi} dpi)`);
    }
  } finally {
    await renderer.close();
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  await main(process.argv[2] ?? ".", Number(process.argv[3] ?? 200));
}
