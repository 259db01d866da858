/**
 * The four widgets built by their kernel-side classes from real fits of simulated data
 * (invented demo scenarios: B1-like two-slit line, a Gaussian-source coherence scan), captured
 * as v2 widget state. Used by the kernel-side tests and for the README screenshots.
 */
import { fitProfile } from "../../src/fit/fitProfile.js";
import { getModel, paramVector, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import { coherenceScanProfile } from "../../src/stats/sourceSize.js";
import { comparison } from "../../kernel-ext/widgets/comparison.js";
import { coherenceScan } from "../../kernel-ext/widgets/coherenceScan.js";
import { explorer } from "../../kernel-ext/widgets/explorer.js";
import { uncertainty } from "../../kernel-ext/widgets/uncertainty.js";
import { widgetStateFromMessages, type WidgetStateDocument } from "../../kernel-ext/widgets/widgetState.js";
import { installFakeKernel } from "./fakeKernel.js";

export const b1Truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };
export const b1Start = { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 };

/** B1-like profile (PROBLEMS.md B1 truth) with `n` pixels over the same 22.5 mm. */
export function b1Profile(n = 1024, seed = 11) {
  const model = getModel("two-slit");
  return simulateProfile(model, paramVector(model, b1Truth), pixelPositions(n, (4096 * 5.5e-6) / n), { noise: "poisson", seed });
}

/** Model ids of each widget in the returned state, by kind. */
export interface DemoWidgets {
  state: WidgetStateDocument;
  ids: { explorer: string; comparison: string; uncertainty: string; coherence: string };
}

/** Build all four widgets with a recording kernel and return their state. */
export function demoWidgets(n = 1024): DemoWidgets {
  const kernel = installFakeKernel();
  try {
    const profile = b1Profile(n);
    const ex = explorer(profile, { start: b1Start, title: "Two-slit line, HeNe 632.8 nm (simulated)" });
    const model = getModel("two-slit");
    const fixed = { wavelength: 632.8e-9, distance: 1 };
    const free = fitProfile(profile, model, { fix: fixed, start: b1Start });
    const coherent = fitProfile(profile, model, { fix: { ...fixed, visibility: 1 }, start: b1Start });
    const single = fitProfile(profile, getModel("single-slit"), { fix: fixed, start: { amplitude: 30000, center: 0.37e-3, width: 0.1e-3, background: 150 } });
    const cmp = comparison(profile, [
      { label: "two-slit, V free", result: free },
      { label: "two-slit, V = 1", result: coherent },
      { label: "single slit", result: single },
    ], { title: "Is the light partially coherent? (simulated)" });
    const unc = uncertainty(free, profile, model, { names: ["separation", "width", "visibility", "phase"], points: 11, title: "Uncertainty of the two-slit fit (simulated)" });
    // Gaussian source of rms size 0.12 mm at 0.8 m, 546 nm; visibilities with σ = 0.015 (seeded).
    const gauss = getModel("coherence-gaussian");
    const seps = [0.1, 0.2, 0.3, 0.45, 0.6, 0.8, 1.0, 1.25, 1.5].map((v) => v * 1e-3);
    const truth = paramVector(gauss, { visibility: 0.97, rmsSize: 0.12e-3, sourceDistance: 0.8, wavelength: 546e-9 });
    const clean = new Float64Array(seps.length);
    gauss.evaluate(Float64Array.from(seps), truth, clean);
    const jitter = [0.012, -0.018, 0.009, 0.02, -0.011, 0.006, -0.009, 0.004, 0.003];
    const scan = coherenceScanProfile(seps, Array.from(clean, (v, i) => v + jitter[i]!), seps.map(() => 0.015));
    const scanFit = fitProfile(scan, gauss, { fix: { sourceDistance: 0.8, wavelength: 546e-9 }, start: { visibility: 0.9, rmsSize: 0.1e-3 } });
    const coh = coherenceScan(scan, scanFit, gauss, { title: "Spatial coherence of a filtered lamp (simulated)", sourceLabel: "Gaussian source (fit)" });
    return {
      state: widgetStateFromMessages(kernel.messages),
      ids: { explorer: ex.widget.id, comparison: cmp.widget.id, uncertainty: unc.widget.id, coherence: coh.widget.id },
    };
  } finally {
    kernel.uninstall();
  }
}
