// Kernel side of the explorer with a recording runtime (no Jupyter): state on the wire, the
// "fit" request, progress, result, text fallbacks.
import { afterEach, describe, expect, it } from "vitest";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { getModel, paramVector, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import { MIME_BUNDLE } from "../../kernel-ext/display.js";
import { explorer } from "../../kernel-ext/widgets/explorer.js";
import { fitJson } from "../../src/report/results/fitJson.js";
import { installFakeKernel } from "./fakeKernel.js";

// B1 of ../shared/bench/PROBLEMS.md, 1024 pixels of 22 µm (same field of view).
const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };
const start = { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 };

function b1Profile() {
  const model = getModel("two-slit");
  return simulateProfile(model, paramVector(model, truth), pixelPositions(1024, 22e-6), { noise: "poisson", seed: 11 });
}

let kernel: ReturnType<typeof installFakeKernel> | null = null;
afterEach(() => {
  kernel?.uninstall();
  kernel = null;
});

describe("explorer (kernel side)", () => {
  it("explorer(profile) opens a jupyter.widget comm with x and y as binary buffers", () => {
    kernel = installFakeKernel();
    const profile = b1Profile();
    explorer(profile, { start });
    const open = kernel.messages.find((m) => m.msgType === "comm_open")!;
    expect(open.content.target_name).toBe("jupyter.widget");
    const state = open.content.data.state;
    expect(state._model_name).toBe("ExplorerModel");
    expect(state._view_module).toBe("fringekit-widgets");
    expect(state.x).toEqual({ dtype: "float64", shape: [1024] });
    const paths = open.content.data.buffer_paths as string[][];
    const xBuffer = open.buffers[paths.findIndex((p) => p[0] === "x" && p[1] === "buffer")]!;
    expect(new Float64Array(xBuffer.buffer, xBuffer.byteOffset, 1024)[5]).toBe(profile.x[5]);
    expect(state.params.separation.value).toBe(0.497e-3);
  });

  it("explorer(profile, {start: {wavelength, distance}}) starts the sliders from the automatic start for that geometry", () => {
    kernel = installFakeKernel();
    // A 680 nm source 0.75 m from the slits: with the model defaults (632.8 nm, 1 m) the same
    // fringe spacing would mean a separation 0.75·632.8/680 ≈ 0.70 of the true one.
    const model = getModel("two-slit");
    const geometry = { wavelength: 680e-9, distance: 0.75 };
    const profile = simulateProfile(model, paramVector(model, { ...truth, ...geometry }), pixelPositions(1024, 22e-6), { noise: "poisson", seed: 12 });
    explorer(profile, { start: geometry });
    const state = kernel.messages.find((m) => m.msgType === "comm_open")!.content.data.state;
    // The automatic start reads the fringe frequency from the spectrum: within 5 % of the truth.
    expect(Math.abs(state.params.separation.value / truth.separation - 1)).toBeLessThan(0.05);
    expect(state.params.wavelength.value).toBe(680e-9);
  });

  it("a frontend {action: 'fit'} runs the fitter with progress and puts the result in explorer.result and the state", async () => {
    kernel = installFakeKernel();
    const profile = b1Profile();
    const ex = explorer(profile, { start });
    const comm = kernel.messages.find((m) => m.msgType === "comm_open")!.content.comm_id as string;
    await kernel.comms.handleMessage({ comm_id: comm, data: { method: "custom", content: { action: "fit" } } }, [], {});
    for (let i = 0; i < 600 && ex.widget.get("fit_state") !== "done"; i++) await new Promise((r) => setTimeout(r, 50));
    expect(ex.widget.get("fit_state")).toBe("done");
    const result = ex.result!;
    // The same fit cell code would run (fitProfile from the same start, noise and fixed set).
    const direct = fitProfile(profile, getModel("two-slit"), { start, fix: { wavelength: 632.8e-9, distance: 1, backgroundSlope: 0, pixelWidth: 0, blur: 0 }, autoStart: false });
    for (const p of direct.parameters) {
      const got = result.parameters.find((q) => q.name === p.name)!;
      expect(got.value).toBeCloseTo(p.value, 6 - Math.floor(Math.log10(Math.abs(p.value) || 1)));
    }
    // Simulation truth within 3 standard errors (PROBLEMS.md B1 acceptance).
    for (const [name, value] of Object.entries(truth)) {
      const p = result.parameters.find((q) => q.name === name)!;
      expect(Math.abs(p.value - value)).toBeLessThan(3 * p.uncertainty);
    }
    const updates = kernel.messages.filter((m) => m.msgType === "comm_msg" && m.content.data.method === "update").map((m) => m.content.data.state);
    expect(updates.some((s) => s.fit_state === "running")).toBe(true);
    expect(updates.some((s) => s.result && s.result.converged === true)).toBe(true);
    // The widget carries the one JSON shape of a fit (as `fringekit fit --json` prints it).
    expect(updates.find((s) => s.result)!.result).toEqual(JSON.parse(JSON.stringify(fitJson(result))));
    expect(ex.params.separation).toBe(result.parameters.find((p) => p.name === "separation")!.value);
  });

  it("explorer(profile, { start, fix }) takes fitProfile's option shape: quantities with units as text", () => {
    kernel = installFakeKernel();
    const ex = explorer(b1Profile(), { start: { ...start, separation: "0.497 mm" }, fix: { wavelength: "632.8 nm", distance: "100 cm" } });
    const params = ex.widget.get("params");
    expect(params.separation!.value).toBeCloseTo(0.497e-3, 15); // 1 mm = 1e-3 m (SI)
    expect(params.wavelength).toMatchObject({ fixed: true });
    expect(params.wavelength!.value).toBeCloseTo(632.8e-9, 20);
    expect(params.distance).toMatchObject({ value: 1, fixed: true });
    expect(() => explorer(b1Profile(), { fix: { wavelength: "632.8 kg" } })).toThrow(/fix\.wavelength/);
  });

  it("explorer masks the browser's masked ranges and window in the fit request", () => {
    kernel = installFakeKernel();
    const ex = explorer(b1Profile(), { start });
    const comm = kernel.messages.find((m) => m.msgType === "comm_open")!.content.comm_id as string;
    void kernel.comms.handleMessage({ comm_id: comm, data: { method: "update", state: { masked_ranges: [[-1e-3, 1e-3]], window: [-8e-3, 8e-3] } } }, [], {});
    const { profile } = ex.fitRequest();
    const used = profile.mask!;
    const x = profile.x;
    for (let i = 0; i < x.length; i++) {
      const inside = x[i]! >= -8e-3 && x[i]! <= 8e-3 && !(x[i]! >= -1e-3 && x[i]! <= 1e-3);
      expect(used[i]).toBe(inside ? 1 : 0);
    }
  });

  it("explorer[MIME_BUNDLE]() carries the widget view and text/plain + text/html fallbacks", () => {
    kernel = installFakeKernel();
    const bundle = explorer(b1Profile(), { start })[MIME_BUNDLE]() as Record<string, unknown>;
    expect(bundle["application/vnd.jupyter.widget-view+json"]).toMatchObject({ version_major: 2 });
    expect(bundle["text/plain"]).toMatch(/Profile explorer\n  1024 points, -11\.253 … 11\.253 mm/);
    expect(bundle["text/html"]).toContain("<li>model two-slit</li>");
  });

  it("explorer(profile, {start: {nonsense}}) names the parameters the model has", () => {
    kernel = installFakeKernel();
    expect(() => explorer(b1Profile(), { start: { nonsense: 1 } })).toThrow(/invalid start: "nonsense" \(a parameter of model two-slit: amplitude/);
  });
});
