// Checks that need the fitter and the physics models: model choice between near- and far-field
// models, and recovery of known truths from seeded simulations for the derived quantities.
import { describe, expect, it } from "vitest";
import { farFieldValidity, fitProfile } from "../../src/api/index.js";
import { getModel, paramVector, pixelPositions, simulateProfile, twoSlitSourceModel } from "../../src/physics/index.js";
import {
  coherenceLength, coherenceScanProfile, compareFits, degreeOfCoherence, fitSourceSizeJointly, fringeGeometry, fringeMaxima,
  sourceSize,
} from "../../src/stats/index.js";
import { seeded } from "./fakeFit.js";

const lambda = 632.8e-9;

/**
 * A Poisson profile simulated with the near-field two-slit model on `pixels` pixels of pitch
 * `pitch` (m), and its near-field fit started at the truth with `nudge` applied.
 */
function nearFieldFit(truth: Record<string, number>, pixels: number, pitch: number, seed: number, nudge: Record<string, number>) {
  const near = getModel("two-slit-fresnel");
  const profile = simulateProfile(near, paramVector(near, truth), pixelPositions(pixels, pitch), { noise: "poisson", seed });
  return { profile, nearFit: fitProfile(profile, near, { start: { ...truth, ...nudge } }) };
}

describe("near-field against far-field model", () => {
  const far = getModel("two-slit");
  it("compareFits prefers two-slit-fresnel by a wide AIC margin on a profile at Fresnel number ≈ 3", () => {
    // a²/(λL) = (0.44 mm)²/(632.8 nm · 0.1 m) = 3.06 (physics farFieldCheck convention).
    const truth = { amplitude: 3000, center: 1e-5, separation: 1e-3, width: 0.44e-3, slits: 2, wavelength: lambda, distance: 0.1, background: 20 };
    const { profile, nearFit } = nearFieldFit(truth, 1000, 3e-6, 11, { amplitude: 2900, width: 0.43e-3, separation: 1.01e-3 });
    // Started at the true geometry, the far-field sinc² lobe (half-width λL/a = 0.14 mm) sits on
    // the dark gap between the two slit images, so the fit falls onto amplitude = 0 with the
    // background at the data mean: a flat line, a stationary point on the bound, not the
    // far-field model's best. The automatic start reads the two slit images as one fringe period
    // and ends far lower; the comparison takes the better of the two, as a careful user would.
    const fromTruth = fitProfile(profile, far, {
      start: { amplitude: Math.max(...profile.y) - 20, center: 1e-5, separation: 1e-3, width: 0.44e-3, visibility: 0.9, phase: 0, wavelength: lambda, distance: 0.1, background: 20 },
    });
    const automatic = fitProfile(profile, far, { start: { wavelength: lambda, distance: 0.1 } });
    const farFit = [fromTruth, automatic].filter((f) => f.converged).sort((a, b) => a.statistics.objective - b.statistics.objective)[0]!;
    expect(farFit.parameters.find((p) => p.name === "amplitude")!.value).toBeGreaterThan(100); // a pattern, not a flat line
    expect(nearFit.converged).toBe(true);
    const result = compareFits([farFit, nearFit], { profile });
    expect(result.preferred).toBe("two-slit-fresnel");
    const farRow = result.rows.find((r) => r.modelId === "two-slit")!;
    expect(farRow.deltaAic).toBeGreaterThan(100);
    // The far fit's own slit width (≈ 42 µm) misreads the geometry and looks far-field; the range
    // check is made on the geometry the near-field fit measured, seen as a far-field fit.
    expect(farFieldValidity({ ...nearFit, modelId: "two-slit" }).warning).toMatch(/far-field model used outside its range/);
    expect(result.verdict).toMatch(/two-slit-fresnel is preferred over two-slit: ΔAIC = \d+/);
  });
  it("compareFits does not prefer two-slit-fresnel by a wide margin on a far-field profile", () => {
    // a²/(λL) = 0.016 and d·a/(λL) = 0.079: inside the far-field range (limit 0.1).
    const truth = { amplitude: 400, center: 2e-5, separation: 0.5e-3, width: 0.1e-3, slits: 2, wavelength: lambda, distance: 1, background: 20 };
    const { profile, nearFit } = nearFieldFit(truth, 2048, 5.5e-6, 5, { amplitude: 390, width: 0.098e-3, separation: 0.501e-3 });
    const farPeak = (truth.amplitude * (2 * truth.width) ** 2) / (lambda * truth.distance);
    const farFit = fitProfile(profile, far, {
      start: { amplitude: farPeak * 0.95, center: 2e-5, separation: 0.501e-3, width: 0.098e-3, visibility: 0.95, phase: 0, wavelength: lambda, distance: 1, background: 20 },
    });
    expect(nearFit.converged && farFit.converged).toBe(true);
    const result = compareFits([farFit, nearFit], { profile });
    const nearRow = result.rows.find((r) => r.modelId === "two-slit-fresnel")!;
    const farRow = result.rows.find((r) => r.modelId === "two-slit")!;
    // "Wide margin" = ΔAIC above 10 (Burnham & Anderson 2002: essentially no support beyond 10).
    expect(farRow.aic - nearRow.aic).toBeLessThan(10);
    expect(farFieldValidity(farFit).valid).toBe(true);
    expect(result.verdict).not.toMatch(/consider the near-field model/);
  });
});

describe("recovery of known truths from seeded fits", () => {
  const far = getModel("two-slit");
  // The B1 bench of the benchmark problems, on 2048 pixels to keep the test light.
  const truth = { amplitude: 20000, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: lambda, distance: 1, background: 150 };
  const start = { amplitude: 18000, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0, wavelength: lambda, distance: 1, background: 100 };
  const x = pixelPositions(2048, 5.5e-6);
  it("fringeGeometry, fringeMaxima and farFieldValidity recover the simulated geometry within their uncertainties", () => {
    const z: Record<string, number[]> = { separation: [], spacing: [], maxima: [], fresnel: [] };
    for (let seed = 1; seed <= 8; seed++) {
      const profile = simulateProfile(far, paramVector(far, truth), x, { noise: "poisson", seed });
      const fit = fitProfile(profile, far, { start });
      expect(fit.converged).toBe(true);
      const q = Object.fromEntries(fringeGeometry(fit, { distance: { value: 1, uncertainty: 1e-3 }, pixelPitchRelative: 1e-3 }).map((v) => [v.name, v]));
      z.separation.push((q.separation.value - truth.separation) / q.separation.uncertainty);
      z.spacing.push((q.fringeSpacing.value - (lambda * 1) / truth.separation) / q.fringeSpacing.uncertainty);
      for (const m of fringeMaxima(fit, x[0], x[x.length - 1])) {
        const s = ((m.order - truth.phase / (2 * Math.PI)) * lambda) / truth.separation;
        z.maxima.push((m.position.value - (truth.center + s / Math.sqrt(1 - s * s))) / m.position.uncertainty);
      }
      const ff = farFieldValidity(fit);
      z.fresnel.push((ff.fresnelNumber.value - truth.width ** 2 / lambda) / ff.fresnelNumber.uncertainty);
    }
    for (const [name, list] of Object.entries(z)) {
      // z = (estimate − truth)/u: each within 4, and mean z² below 3.27, the 99.9 % point of
      // χ²(8)/8 (A&S Table 26.8: χ²_{0.001}(8) = 26.12) for 8 independent seeds.
      expect(Math.max(...list.map(Math.abs)), name).toBeLessThan(4);
      expect(list.reduce((a, v) => a + v * v, 0) / list.length, name).toBeLessThan(3.27);
    }
  });
});

describe("coherence quantities from seeded fits", () => {
  const x = pixelPositions(2048, 5.5e-6);
  const zScores = (list: number[], name: string) => {
    // Same acceptance as above: each |z| < 4 and mean z² below the 99.9 % point of χ²(n)/n
    // (A&S Table 26.8: χ²_{0.001}(6) = 22.46, so 3.74 for six seeds).
    expect(Math.max(...list.map(Math.abs)), name).toBeLessThan(4);
    expect(list.reduce((a, v) => a + v * v, 0) / list.length, name).toBeLessThan(3.74);
  };
  it("degreeOfCoherence recovers |γ12| from the fitted visibility and a measured intensity ratio", () => {
    // Unequal beams r = I1/I2 = 0.5 and |γ12| = 0.9 give V = 2√r/(1 + r) · |γ12| (Born & Wolf §10.4.1).
    const r = 0.5, gamma = 0.9;
    const visibility = ((2 * Math.sqrt(r)) / (1 + r)) * gamma;
    const far = getModel("two-slit");
    const truth = { amplitude: 8000, center: 0.1e-3, separation: 0.5e-3, width: 0.1e-3, visibility, phase: 0.2, wavelength: lambda, distance: 1, background: 100 };
    const z: number[] = [];
    for (let seed = 1; seed <= 6; seed++) {
      const profile = simulateProfile(far, paramVector(far, truth), x, { noise: "poisson", seed });
      const fit = fitProfile(profile, far, { start: { ...truth, visibility: 0.7, amplitude: 7000 } });
      const v = fit.parameters.find((p) => p.name === "visibility")!;
      const g = degreeOfCoherence({ value: v.value, uncertainty: v.uncertainty }, { value: r, uncertainty: 0.005 });
      z.push((g.value - gamma) / g.uncertainty);
    }
    zScores(z, "gamma");
  });
  it("coherenceLength recovers λ²/Δλ from a fitted two-slit-broadband bandwidth", () => {
    const model = getModel("two-slit-broadband");
    const truth = { amplitude: 20000, center: 0, separation: 0.5e-3, width: 0.05e-3, visibility: 0.9, phase: 0, wavelength: 600e-9, bandwidth: 20e-9, distance: 1, background: 50 };
    const z: number[] = [];
    for (let seed = 1; seed <= 6; seed++) {
      const profile = simulateProfile(model, paramVector(model, truth), x, { noise: "poisson", seed });
      const fit = fitProfile(profile, model, { start: { ...truth, bandwidth: 15e-9, visibility: 0.8 }, free: ["bandwidth"] });
      expect(fit.converged).toBe(true);
      const b = fit.parameters.find((p) => p.name === "bandwidth")!;
      const lc = coherenceLength({ value: 600e-9, uncertainty: 0 }, { value: b.value, uncertainty: b.uncertainty });
      z.push((lc.value - (600e-9) ** 2 / 20e-9) / lc.uncertainty);
    }
    zScores(z, "coherence length");
  });
  it("fringeGeometry recovers the wavelength from a known separation when the fit assumed a nominal one", () => {
    const far = getModel("two-slit");
    const truth = { amplitude: 20000, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: lambda, distance: 1, background: 150 };
    const z: number[] = [];
    for (let seed = 1; seed <= 6; seed++) {
      const profile = simulateProfile(far, paramVector(far, truth), x, { noise: "poisson", seed });
      // The fit holds λ at a nominal 600 nm, so its separation absorbs the difference.
      const fit = fitProfile(profile, far, { start: { ...truth, wavelength: 600e-9, separation: 0.47e-3, amplitude: 18000 } });
      const q = fringeGeometry(fit, { separation: { value: 0.5e-3, uncertainty: 0.5e-6 }, distance: { value: 1, uncertainty: 1e-3 }, pixelPitchRelative: 1e-3 });
      const w = q.find((v) => v.name === "wavelength")!;
      z.push((w.value - lambda) / w.uncertainty);
    }
    zScores(z, "wavelength");
  });
});

describe("source size from a coherence scan", () => {
  const separations = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2].map((d) => d * 1e-3);
  const u = 0.01;
  for (const [id, sizeName, size] of [["coherence-disc", "diameter", 0.5e-3], ["coherence-gaussian", "rmsSize", 0.12e-3]] as const) {
    it(`sourceSize(fit of ${id}) covers the simulated ${sizeName} with its 95 % interval in most seeded scans`, () => {
      const model = getModel(id);
      const truth = { visibility: 0.95, [sizeName]: size, sourceDistance: 1, wavelength: 550e-9 };
      const clean = new Float64Array(separations.length);
      model.evaluate(Float64Array.from(separations), paramVector(model, truth), clean);
      let covered = 0;
      const runs = 40;
      for (let seed = 1; seed <= runs; seed++) {
        const rng = seeded(seed);
        const scan = coherenceScanProfile(separations, Array.from(clean, (v) => v + u * rng.normal()), separations.map(() => u));
        const fit = fitProfile(scan, model, { start: { ...truth, [sizeName]: size * 1.2, visibility: 0.9 }, sigmaAbsolute: true });
        expect(fit.converged).toBe(true);
        const result = sourceSize(fit, { sourceDistance: { value: 1, uncertainty: 0 } });
        if (result.interval[0] <= size && size <= result.interval[1]) covered++;
      }
      // Nominal 95 %; with 40 scans, 33 or more covered is expected (binomial, p ≈ 0.99).
      expect(covered).toBeGreaterThanOrEqual(33);
    });
  }
});

describe("source size from raw profiles fitted jointly", () => {
  it("fitSourceSizeJointly(scans, 'disc') recovers the simulated diameter within its interval", () => {
    const diameter = 0.5e-3;
    const sourceDistance = 1;
    const wavelength = 550e-9;
    const model = twoSlitSourceModel("disc");
    const x = pixelPositions(1024, 5.5e-6);
    const separations = [0.2e-3, 0.4e-3, 0.6e-3, 0.8e-3, 1.0e-3];
    let covered = 0;
    const runs = 6;
    for (let seed = 1; seed <= runs; seed++) {
      const scans = separations.map((separation, i) => {
        const truth = { amplitude: 5000, center: 1e-5 * i, separation, width: 0.08e-3, visibility: 0.95, phase: 0.1 * i, wavelength, distance: 1, background: 100, diameter, sourceDistance };
        const profile = simulateProfile(model, paramVector(model, truth), x, { noise: "poisson", seed: 100 * seed + i });
        return { profile, separation, start: { amplitude: 4800, center: 1e-5 * i, phase: 0.1 * i, background: 90, width: 0.08e-3 } };
      });
      const result = fitSourceSizeJointly(scans, "disc", { start: { diameter: 0.6e-3, visibility: 0.9, wavelength, distance: 1, sourceDistance } });
      expect(result.joint.converged).toBe(true);
      expect(result.size.unit).toBe("m");
      if (result.interval[0] <= diameter && diameter <= result.interval[1]) covered++;
      expect(Math.abs(result.size.value - diameter)).toBeLessThan(4 * result.size.uncertainty);
    }
    // Nominal 95 % intervals: at least 5 of 6 should cover (binomial, p ≈ 0.97).
    expect(covered).toBeGreaterThanOrEqual(5);
  });
});
