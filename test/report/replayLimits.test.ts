// replayResults(untrusted results document) refuses, before any fit, documents whose model
// cost is beyond the limits (spectrum samples, quadrature nodes, points × nodes × samples,
// number of fits, evaluation budget), naming the limit. The engine here fails the test if asked to fit.
import { describe, expect, it } from "vitest";
import { DataError } from "../../src/index.js";
import { replayResults, REPLAY_LIMITS } from "../../src/api/replay.js";
import type { ResultsDocument } from "../../src/report/results/resultsDocument.js";

const engine = {
  getModel: () => { throw new Error("replay built a model before checking its cost"); },
  fitProfile: () => { throw new Error("replay fitted before checking its cost"); },
};
function doc(fit: Record<string, unknown>, fits = 1, points = 1000): ResultsDocument {
  return {
    input: { source: "scan.csv", sha256: null, points, readOptions: {} },
    fits: Array.from({ length: fits }, (_, i) => ({ label: `fit ${i}`, modelId: "two-slit-spectrum", modelOptions: {}, fitOptions: {}, result: {}, ...fit })),
  } as unknown as ResultsDocument;
}
const spectrum = (n: number) => ({ wavelengths: Array.from({ length: n }, (_, i) => 500e-9 + i * 1e-12), weights: Array.from({ length: n }, () => 1) });

describe("replayResults(doc with an excessive cost)", () => {
  const cases: [string, ResultsDocument, RegExp][] = [
    ["a 100 000-sample spectrum", doc({ modelOptions: { spectrum: spectrum(100_000) } }), /spectrum of 100000 samples, above the limit of \d+/],
    ["64 × 64 quadrature nodes with a 2000-sample spectrum", doc({ modelOptions: { spectrum: spectrum(2000), pixelNodes: 64, blurNodes: 64 } }), /model cost of .* above the limit/],
    ["1000 fits", doc({ modelId: "two-slit" }, 1000), /1000 fits, above the limit of \d+/],
    ["maxEvaluations 1e9", doc({ modelId: "two-slit", fitOptions: { maxEvaluations: 1e9 } }), /maxEvaluations 1000000000, above the limit of \d+/],
    ["pixelNodes 1e6", doc({ modelId: "two-slit", modelOptions: { pixelNodes: 1e6 } }), /pixelNodes 1000000, above the limit of 64/],
  ];
  for (const [title, d, expected] of cases) {
    it(`replayResults(${title}) throws a DataError naming the limit, before fitting`, () => {
      const start = performance.now();
      let error: unknown;
      try { replayResults(d, null, engine); } catch (caught) { error = caught; }
      expect(error).toBeInstanceOf(DataError);
      expect((error as Error).message).toMatch(expected);
      expect(performance.now() - start).toBeLessThan(1000);
    });
  }

  it("REPLAY_LIMITS are stated (README lists them)", () => {
    expect(REPLAY_LIMITS.spectrumSamples).toBeGreaterThanOrEqual(1000);
    expect(REPLAY_LIMITS.fits).toBeGreaterThanOrEqual(10);
  });
});
