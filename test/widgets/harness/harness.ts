// Test page: the offline pages' kernel-less widget manager (widgets/src/pageManager.ts), a loader
// that resolves fringekit's widget module, and helpers to show widgets with simulated data (invented demo scenarios).
import Plotly from "plotly.js-dist-min";
import { getModel, paramVector, pixelPositions, simulateProfile } from "../../../src/physics/index.js";
import { arrayToWire } from "../../../widgets/src/arrayWire.js";
import { PageWidgetManager } from "../../../widgets/src/pageManager.js";
import * as widgetModule from "../../../widgets/src/index.js";
import { registerPhysicsModels } from "../../../widgets/src/registerPhysics.js";

registerPhysicsModels();

const manager = new PageWidgetManager(async (name: string) => {
  if (name === widgetModule.MODULE_NAME) return widgetModule;
  throw new Error(`test page: no module ${name}`);
});

const views = new Map<string, any>();
let counter = 0;

/** Create a model with wire-form state and display one view in `host` (default: a new div in body). */
async function show(modelName: string, state: Record<string, unknown>, host?: HTMLElement): Promise<string> {
  const id = `w${++counter}`;
  const model = await manager.new_model({
    model_name: modelName,
    model_module: widgetModule.MODULE_NAME,
    model_module_version: widgetModule.MODULE_VERSION,
    model_id: id,
  }, state);
  const el = host ?? document.body.appendChild(Object.assign(document.createElement("div"), { id: `host-${id}` }));
  const view = await manager.create_view(model);
  await manager.display_view(view, el);
  views.set(id, view);
  return id;
}

const f64 = (data: Float64Array, shape = [data.length]) => arrayToWire({ data, shape });

/** B1-like two-slit profile (PROBLEMS.md B1 truth), `n` pixels, Poisson counts. */
function b1State(n = 4096, seed = 3): Record<string, unknown> {
  const model = getModel("two-slit");
  const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1 };
  const known = Object.fromEntries(Object.entries(truth).filter(([k]) => model.parameters.some((p) => p.name === k)));
  const x = pixelPositions(n, 4096 * 5.5e-6 / n);
  const profile = simulateProfile(model, paramVector(model, known), x, { noise: "poisson", seed });
  const start: Record<string, number> = { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 };
  const params: Record<string, unknown> = {};
  for (const spec of model.parameters) {
    params[spec.name] = { value: start[spec.name] ?? (known as Record<string, number>)[spec.name] ?? spec.default, fixed: spec.fixedByDefault === true || spec.integer === true, lower: spec.lower, upper: spec.upper };
  }
  return {
    title: "Two-slit profile (simulated)",
    x: f64(profile.x), y: f64(profile.y), counts: true, y_unit: "counts",
    model_id: "two-slit", params, noise: "auto",
  };
}

/** Two two-slit fits of a B1-like profile overlaid (invented demo numbers for the table). */
function comparisonState(n = 2048): Record<string, unknown> {
  const model = getModel("two-slit");
  const x = pixelPositions(n, 4096 * 5.5e-6 / n);
  const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };
  const profile = simulateProfile(model, paramVector(model, truth), x, { noise: "poisson", seed: 5 });
  const variants = [truth, { ...truth, visibility: 1, amplitude: 17500 }, { ...truth, width: 0.09e-3, amplitude: 19000 }];
  const curves = new Float64Array(variants.length * n);
  const resid = new Float64Array(variants.length * n);
  const out = new Float64Array(n);
  variants.forEach((v, k) => {
    model.evaluate(x, paramVector(model, v), out);
    for (let i = 0; i < n; i++) {
      curves[k * n + i] = out[i]!;
      resid[k * n + i] = (profile.y[i]! - out[i]!) / Math.sqrt(Math.max(out[i]!, 1));
    }
  });
  return {
    title: "Which source model? (simulated)",
    x: f64(x), y: f64(profile.y), y_unit: "counts",
    curves: f64(curves, [variants.length, n]), residuals: f64(resid, [variants.length, n]),
    table: [
      { label: "partial coherence (V free)", modelId: "two-slit", k: 7, reducedChi2: 1.012, aic: 2101.4, bic: 2141.2, deltaAic: 0, weight: 0.998, converged: true },
      { label: "full coherence (V = 1)", modelId: "two-slit", k: 6, reducedChi2: 7.93, aic: 16203.7, bic: 16237.8, deltaAic: 14102.3, weight: 0, converged: true },
      { label: "narrow slits", modelId: "two-slit", k: 7, reducedChi2: 1.016, aic: 2113.9, bic: 2153.7, deltaAic: 12.5, weight: 0.002, converged: true },
    ],
    verdict: "partial coherence (V free) is preferred: ΔAIC = 12.5 to the next model (weight 0.998).",
  };
}

/** Profile-likelihood curves for four parameters with a mildly asymmetric shape (invented demo). */
function uncertaintyState(): Record<string, unknown> {
  const params = [
    { name: "separation", unit: "m", best: 0.5003e-3, uncertainty: 0.0009e-3 },
    { name: "width", unit: "m", best: 0.1002e-3, uncertainty: 0.0004e-3 },
    { name: "visibility", unit: "1", best: 0.8497, uncertainty: 0.0021 },
    { name: "phase", unit: "rad", best: 0.302, uncertainty: 0.011 },
  ];
  const m = 41;
  const grid = new Float64Array(params.length * m);
  const delta = new Float64Array(params.length * m);
  const out = params.map((p, k) => {
    const skew = 0.08 * (k % 2 === 0 ? 1 : -1);
    for (let j = 0; j < m; j++) {
      const z = -3 + (6 * j) / (m - 1);
      grid[k * m + j] = p.best + z * p.uncertainty;
      delta[k * m + j] = z * z * (1 + skew * z);
    }
    const root = (sign: number) => {
      let z = 0;
      while (z * z * (1 + skew * sign * z) < 1 && z < 3) z += 0.001;
      return p.best + sign * z * p.uncertainty;
    };
    return { name: p.name, unit: p.unit, best: p.best, uncertainty: p.uncertainty, interval: [root(-1), root(1)] };
  });
  const names = ["separation", "width", "visibility", "phase", "center"];
  const c = [1, 0.12, -0.05, 0.41, -0.38, 0.12, 1, -0.63, 0.02, 0.01, -0.05, -0.63, 1, 0.04, -0.02, 0.41, 0.02, 0.04, 1, -0.92, -0.38, 0.01, -0.02, -0.92, 1];
  return {
    title: "Uncertainty of the two-slit fit (simulated)",
    parameters: out, grid: f64(grid, [params.length, m]), delta: f64(delta, [params.length, m]),
    level: 0.6827, threshold: 1, free_names: names, correlation: f64(Float64Array.from(c), [5, 5]),
  };
}

/** Visibility against slit separation for a Gaussian source (invented demo scenario). */
function coherenceState(): Record<string, unknown> {
  const lambda = 546e-9;
  const z = 0.8;
  const rms = 0.12e-3;
  const vis = (d: number) => 0.97 * Math.exp(-2 * (Math.PI * rms * d / (lambda * z)) ** 2);
  const seps = Float64Array.from([0.1, 0.2, 0.3, 0.45, 0.6, 0.8, 1.0, 1.25, 1.5].map((v) => v * 1e-3));
  const noise = [0.012, -0.018, 0.009, 0.02, -0.011, 0.006, -0.009, 0.004, 0.003];
  const v = seps.map((d, i) => vis(d) + noise[i]!);
  const err = Float64Array.from(seps, () => 0.015);
  const fine = Float64Array.from({ length: 121 }, (_, i) => (i / 120) * 1.6e-3);
  const curve = fine.map(vis);
  return {
    title: "Spatial coherence scan (simulated)",
    separation: f64(seps), visibility: f64(v), visibility_err: f64(err),
    curve_separation: f64(fine), curve_visibility: f64(curve),
    band_lower: f64(curve.map((c) => Math.max(0, c - 0.02 * Math.sin(Math.PI * Math.min(1, c + 0.1))))),
    band_upper: f64(curve.map((c) => Math.min(1, c + 0.02 * Math.sin(Math.PI * Math.min(1, c + 0.1))))),
    source_label: "Gaussian source, rms size σ",
    quantities: [
      { name: "rmsSize", unit: "m", value: 0.1203e-3, uncertainty: 0.0031e-3 },
      { name: "visibility at zero separation", unit: "1", value: 0.968, uncertainty: 0.008 },
    ],
  };
}

/**
 * Move the slider of `param` through `steps` positions as a drag would (input events, one per
 * frame) and return the time (ms) from each input event to the redrawn model curve.
 */
async function measureSlider(id: string, param: string, steps: number): Promise<number[]> {
  const el = views.get(id).el as HTMLElement;
  const slider = el.querySelector<HTMLInputElement>(`input[type=range][data-param="${param}"]`)!;
  const times: number[] = [];
  for (let k = 0; k < steps; k++) {
    const redrawn = new Promise<number>((resolve) =>
      el.addEventListener("fk-redraw", (e) => resolve((e as CustomEvent).detail.done), { once: true }));
    slider.value = String(Math.round(500 + 300 * Math.sin(k / 7)));
    const t0 = performance.now();
    slider.dispatchEvent(new Event("input", { bubbles: true }));
    times.push((await redrawn) - t0);
    await new Promise((r) => requestAnimationFrame(r));
  }
  return times;
}

/**
 * Reference for B4: plotly alone redrawing the same figure with a precomputed 8192-point model
 * curve and residuals as SVG traces (what the explorer would cost without its canvas layer).
 */
async function measurePlotlyAlone(id: string, steps: number): Promise<number[]> {
  const el = views.get(id).el as HTMLElement;
  const plot = el.querySelector(".js-plotly-plot") as HTMLElement & { data: { x: ArrayLike<number>; y: ArrayLike<number> }[] };
  const x = Float64Array.from(plot.data[0]!.x);
  const base = Float64Array.from(plot.data[0]!.y, (v) => (Number.isFinite(v) ? v : 0));
  const times: number[] = [];
  for (let k = 0; k < steps; k++) {
    const scale = 1 + 0.2 * Math.sin(k / 7);
    const curve = base.map((v) => v * scale);
    const resid = base.map((v) => (v - v * scale) / Math.sqrt(Math.max(v, 1)));
    const t0 = performance.now();
    await Plotly.restyle(plot, { x: [x, x], y: [curve, resid] }, [2, 4]);
    times.push(performance.now() - t0);
    await new Promise((r) => requestAnimationFrame(r));
  }
  await Plotly.restyle(plot, { x: [[null], [null]], y: [[null], [null]] }, [2, 4]);
  return times;
}

Object.assign(window, { fk: { manager, show, views, b1State, comparisonState, uncertaintyState, coherenceState, f64, widgetModule, measureSlider, measurePlotlyAlone } });
document.body.dataset.ready = "1";
