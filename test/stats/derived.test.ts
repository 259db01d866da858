import { describe, expect, it } from "vitest";
import {
  bandwidthFromVisibilityDecay, coherenceLength, degreeOfCoherence, derivedQuantities, fringeGeometry, fringeMaxima, localVisibilities, measuredExtrema, propagateDerived,
} from "../../src/stats/index.js";
import { getModel, paramVector, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import { fakeFit, seeded } from "./fakeFit.js";
import { expectClose } from "./python.js";

const truth = { amplitude: 1000, center: 2e-5, separation: 0.5e-3, width: 0.1e-3, visibility: 0.8, phase: 0.3, wavelength: 632.8e-9, distance: 1 };
const uSep = 1e-6;
const fit = fakeFit({ modelId: "two-slit", free: ["amplitude", "center", "separation"], values: truth,
  uncertainty: { amplitude: 3, center: 1e-7, separation: uSep }, logLikelihood: -1, chi2: 1, n: 10 });

describe("propagateDerived and fringe geometry", () => {
  it("propagateDerived(fit, calibration, f) adds covariance and calibration terms in quadrature (GUM 5.1.2)", () => {
    // f = separation · distance_cal: u² = (L u_d)² + (d u_L)², by hand.
    const r = propagateDerived(fit, { distance: { value: 2, uncertainty: 0.01 } }, (v) => v.separation * v["cal.distance"]);
    expectClose(r.value, 1e-3, 1e-15, "value");
    expectClose(r.uncertainty, Math.hypot(2 * uSep, 0.5e-3 * 0.01), 1e-7, "u");
  });
  it("fringeGeometry(fit, calibration) gives spacing λL/d and separation with distance and pitch terms", () => {
    const calibration = { distance: { value: 1.001, uncertainty: 1e-3 }, pixelPitchRelative: 1e-3 };
    const q = Object.fromEntries(fringeGeometry(fit, calibration).map((x) => [x.name, x]));
    // By hand: Λ = λL/d = 1.2656 mm; u(Λ)/Λ = (u_d/d) ⊕ pitch (the fit's own L sets the detector frequency).
    expectClose(q.fringeSpacing.value, 632.8e-9 / 0.5e-3, 1e-12, "spacing");
    expectClose(q.fringeSpacing.uncertainty / q.fringeSpacing.value, Math.hypot(uSep / 0.5e-3, 1e-3), 1e-6, "u(spacing)");
    expect(q.fringeSpacing.unit).toBe("m");
    // d = λ q L_cal / s = 0.5 mm × 1.001; relative u = (u_d/d) ⊕ (u_L/L) ⊕ pitch.
    expectClose(q.separation.value, 0.5e-3 * 1.001, 1e-12, "separation");
    expectClose(q.separation.uncertainty / q.separation.value, Math.hypot(uSep / 0.5e-3, 1e-3 / 1.001, 1e-3), 1e-6, "u(separation)");
  });
  it("fringeGeometry(fit, { separation }) gives the wavelength from a known separation", () => {
    const q = fringeGeometry(fit, { separation: { value: 0.5e-3, uncertainty: 0.5e-6 } }).find((x) => x.name === "wavelength")!;
    expectClose(q.value, 632.8e-9, 1e-12, "wavelength");
    expectClose(q.uncertainty / q.value, Math.hypot(uSep / 0.5e-3, 1e-3), 1e-6, "u(wavelength)");
  });
  it("fringeMaxima(fit, xMin, xMax) puts order m at center + L tan θ with sin θ = (m − φ/2π) λ/d", () => {
    const maxima = fringeMaxima(fit, -3e-3, 3e-3);
    const zero = maxima.find((m) => m.order === 0)!;
    const s = (-0.3 / (2 * Math.PI) * 632.8e-9) / 0.5e-3;
    expectClose(zero.position.value, 2e-5 + s / Math.sqrt(1 - s * s), 1e-12, "x_0");
    // spacing λL/d = 632.8 nm · 1 m / 0.5 mm = 1.27 mm, so ±3 mm holds orders −2…2 (hand count)
    expect(maxima.map((m) => m.order)).toEqual([-2, -1, 0, 1, 2]);
    expect(zero.position.uncertainty).toBeGreaterThan(1e-7 * 0.99); // never below the centre's own standard error, 1e-7 m in this fit
  });
});

describe("measuredExtrema", () => {
  it("measuredExtrema(profile, fit) recovers the maxima and minima of a seeded simulation within the reported uncertainty", () => {
    const model = getModel("two-slit");
    const params = paramVector(model, { ...truth, amplitude: 5000, background: 100 });
    const x = pixelPositions(1500, 5.5e-6);
    const fine = new Float64Array(200_001).map((_, i) => -4.2e-3 + (i * 8.4e-3) / 200_000);
    const mean = new Float64Array(fine.length);
    model.evaluate(fine, params, mean);
    let within2 = 0, total = 0, worst = 0;
    for (let seed = 1; seed <= 6; seed++) {
      const profile = simulateProfile(model, params, x, { noise: "poisson", seed });
      const extrema = measuredExtrema(profile, { ...fit, model: new Float64Array(x.length) });
      expect(extrema.length).toBeGreaterThan(8); // 8.25 mm of line over half-spacings of 0.63 mm: about 13 extrema (hand count)
      for (const e of extrema) {
        // Truth: the extremum of the noise-free mean on a 42 nm grid near the measured one.
        let best = -1;
        for (let i = 0; i < fine.length; i++) {
          if (Math.abs(fine[i] - e.position.value) > 0.2e-3) continue;
          if (best < 0 || (e.kind === "maximum" ? mean[i] > mean[best] : mean[i] < mean[best])) best = i;
        }
        const z = Math.abs(e.position.value - fine[best]) / e.position.uncertainty;
        worst = Math.max(worst, z);
        if (z < 2) within2++;
        total++;
      }
    }
    // Gaussian coverage of ±2u is 95 %; allow sampling scatter over ~100 extrema.
    expect(within2 / total).toBeGreaterThan(0.88);
    expect(worst).toBeLessThan(4.5);
  });
});

describe("coherence", () => {
  it("degreeOfCoherence(V, r) = V (1 + r)/(2√r) on a case computed by hand", () => {
    // r = 4: (1 + 4)/(2·2) = 1.25, so |γ| = 0.6 × 1.25 = 0.75; ∂/∂r = V (r − 1)/(4 r^1.5) = 0.05625.
    const g = degreeOfCoherence({ value: 0.6, uncertainty: 0.01 }, { value: 4, uncertainty: 0.2 });
    expectClose(g.value, 0.75, 1e-15, "gamma");
    expectClose(g.uncertainty, Math.hypot(0.0125, 0.05625 * 0.2), 1e-12, "u");
    expect(() => degreeOfCoherence({ value: 1.2, uncertainty: 0 }, { value: 1, uncertainty: 0 })).toThrow(/invalid visibility: 1.2/);
  });
  it("coherenceLength(λ, Δλ) = λ²/Δλ", () => {
    // 632.8 nm with 1 nm FWHM: 0.40044 mm (by hand).
    const l = coherenceLength({ value: 632.8e-9, uncertainty: 0 }, { value: 1e-9, uncertainty: 0.1e-9 });
    expectClose(l.value, 632.8e-9 ** 2 / 1e-9, 1e-14, "lc");
    expectClose(l.uncertainty, l.value * 0.1, 1e-12, "u");
  });
  it("bandwidthFromVisibilityDecay(orders, V, λ) recovers a seeded Gaussian-spectrum bandwidth within its uncertainty", () => {
    const lambda = 600e-9;
    const dl = 20e-9;
    const orders = [0, 2, 4, 6, 8, 10, 12, 14];
    let inside = 0;
    const runs = 40;
    for (let seed = 1; seed <= runs; seed++) {
      const rng = seeded(seed);
      const u = 0.01;
      const vis = orders.map((m) => ({ value: 0.9 * Math.exp(-(((Math.PI * m * dl) / lambda) ** 2) / (4 * Math.LN2)) + u * rng.normal(), uncertainty: u }));
      const [bandwidth, v0] = bandwidthFromVisibilityDecay(orders, vis, { value: lambda, uncertainty: 0 });
      if (Math.abs(bandwidth.value - dl) < 2 * bandwidth.uncertainty) inside++;
      expect(Math.abs(v0.value - 0.9)).toBeLessThan(5 * v0.uncertainty); // within a few standard uncertainties (common practice)
    }
    // ±2u covers 95 % for a Gaussian estimate; 40 runs, allow sampling scatter.
    expect(inside / runs).toBeGreaterThan(0.85);
  });
});

describe("localVisibilities", () => {
  it("localVisibilities(profile, fit) → bandwidthFromVisibilityDecay recovers a seeded broadband bandwidth within its uncertainty", () => {
    const model = getModel("two-slit-broadband");
    const bench = { amplitude: 20000, center: 0, separation: 0.5e-3, width: 0.03e-3, visibility: 0.9, phase: 0, wavelength: 600e-9, bandwidth: 30e-9, distance: 1, background: 50 };
    const x = pixelPositions(4096, 5.5e-6);
    const fitLike = fakeFit({ modelId: "two-slit-broadband", free: ["amplitude"], values: bench, logLikelihood: 0, chi2: 1, n: x.length });
    let inside = 0;
    const seeds = 5;
    for (let seed = 1; seed <= seeds; seed++) {
      const profile = simulateProfile(model, paramVector(model, bench), x, { noise: "poisson", seed });
      const local = localVisibilities(profile, { ...fitLike, model: new Float64Array(x.length) });
      expect(local.length).toBeGreaterThan(14); // 22.5 mm of line over a 1.2 mm fringe spacing: about 18 orders (hand count)
      const [bandwidth, v0] = bandwidthFromVisibilityDecay(local.map((l) => l.order),
        local.map((l) => ({ value: l.visibility, uncertainty: l.uncertainty })), { value: 600e-9, uncertainty: 0 });
      if (Math.abs(bandwidth.value - 30e-9) < 2 * bandwidth.uncertainty) inside++;
      expect(Math.abs(bandwidth.value - 30e-9)).toBeLessThan(4 * bandwidth.uncertainty);
      expect(Math.abs(v0.value - 0.9)).toBeLessThan(4 * v0.uncertainty);
    }
    expect(inside).toBeGreaterThanOrEqual(4); // ±2u covers 95 %: 4 or 5 of 5 seeds expected (common practice)
  });
});

describe("derivedQuantities", () => {
  it("derivedQuantities(fit, options) lists every supported quantity with value, uncertainty and unit", () => {
    const broadband = fakeFit({ modelId: "two-slit-broadband", free: ["amplitude", "center", "separation", "visibility", "bandwidth"],
      values: { ...truth, bandwidth: 2e-9 }, uncertainty: { amplitude: 3, center: 1e-7, separation: uSep, visibility: 0.01, bandwidth: 0.1e-9 }, logLikelihood: -1, chi2: 1, n: 10 });
    const report = derivedQuantities(broadband, { intensityRatio: { value: 1, uncertainty: 0.02 } });
    expect(report.quantities.map((q) => q.name)).toEqual(["fringeSpacing", "fringeFrequency", "separation", "fresnelNumber", "offsetNumber", "degreeOfCoherence", "coherenceLength"]);
    for (const q of report.quantities) {
      // Width is fixed here, so the Fresnel numbers carry only calibration uncertainty (none given): 0.
      expect(Number.isFinite(q.value) && q.uncertainty >= 0 && Number.isFinite(q.uncertainty) && q.unit.length > 0, q.name).toBe(true);
    }
    // |γ12| = V for equal beams; l_c = λ²/Δλ with 5 % relative u (by hand).
    expectClose(report.quantities[5].value, 0.8, 1e-15, "gamma");
    expectClose(report.quantities[6].uncertainty / report.quantities[6].value, 0.05, 1e-12, "u(lc)");
    expect(report.warnings).toEqual([]);
  });
});
