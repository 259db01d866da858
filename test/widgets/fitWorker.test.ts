// The explorer's fit in a worker thread (compiled dist/, as the kernel loads it): the kernel
// thread stays free while the solver runs, so a Cancel message reaches it and stops the fit.
import { existsSync } from "node:fs";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { getModel, paramVector, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import { repoRoot } from "../kernel/helpers.js";
import { installFakeKernel } from "./fakeKernel.js";

const compiled = path.join(repoRoot, "dist/kernel-ext/widgets/explorer.js");
const run = existsSync(compiled) ? describe : describe.skip;
if (!existsSync(compiled)) console.warn("test/widgets/fitWorker: skipped, dist/ is not built (npm run build)");

let kernel: ReturnType<typeof installFakeKernel> | null = null;
afterEach(() => {
  kernel?.uninstall();
  kernel = null;
});

run("explorer fit in a worker thread", () => {
  it("a frontend {action: 'cancel'} stops a running fit; the explorer reports it as cancelled", async () => {
    kernel = installFakeKernel();
    const { explorer } = (await import(compiled)) as typeof import("../../kernel-ext/widgets/explorer.js");
    const model = getModel("two-slit");
    // B1 truth on 131072 pixels over the same 22 mm, started far off: a fit of seconds.
    const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };
    const profile = simulateProfile(model, paramVector(model, truth), pixelPositions(131072, 0.17e-6), { noise: "poisson", seed: 2 });
    const ex = explorer(profile, { start: { amplitude: 15000, background: 50, center: 0.2e-3, separation: 0.49e-3, width: 0.13e-3, visibility: 0.5, phase: 1 } });
    const comm = kernel.messages.find((m) => m.msgType === "comm_open")!.content.comm_id as string;
    const running = ex.fit();
    await new Promise((r) => setTimeout(r, 400));
    expect(ex.widget.get("fit_state")).toBe("running");
    await kernel.comms.handleMessage({ comm_id: comm, data: { method: "custom", content: { action: "cancel" } } }, [], {});
    const result = await running;
    expect(result.reason).toBe("cancelled");
    expect(ex.widget.get("fit_state")).toBe("cancelled");
    expect(ex.result).toBe(result);
  });

  it("the worker fits exactly the model shown: model options and formula models are rebuilt from their source", async () => {
    kernel = installFakeKernel();
    const { explorer } = (await import(compiled)) as typeof import("../../kernel-ext/widgets/explorer.js");
    const { fitProfileResult } = await import("../../src/advanced.js");
    // The model must come from the same (compiled) library the explorer runs on, as in a notebook.
    const { formulaModel } = (await import(path.join(repoRoot, "dist/src/advanced.js"))) as typeof import("../../src/advanced.js");
    // Wide angles (±10 mm at 5 cm), where small-angle and exact geometry give different fits.
    const small = getModel("two-slit", { smallAngle: true });
    const truth = { amplitude: 5000, background: 100, center: 0.1e-3, separation: 0.2e-3, width: 0.04e-3, visibility: 0.9, phase: 0.2, wavelength: 632.8e-9, distance: 0.05 };
    const profile = simulateProfile(small, paramVector(small, truth), pixelPositions(800, 25e-6, -10e-3), { noise: "poisson", seed: 5 });
    const ex = explorer(profile, { model: "two-slit", modelOptions: { smallAngle: true }, start: truth });
    const request = ex.fitRequest();
    const fit = await ex.fit();
    const direct = fitProfileResult(request.profile, small, request.options);
    fit.parameters.forEach((p, j) => expect(p.value).toBeCloseTo(direct.parameters[j].value, 10));
    // A formula model: before, the worker could only rebuild registry models by id.
    const line = { x: Float64Array.from({ length: 20 }, (_, i) => i), y: Float64Array.from({ length: 20 }, (_, i) => 1 + 2 * i + (i % 3) - 1), yUnit: "a.u.", counts: false };
    const exLine = explorer(line, { model: formulaModel("a + b*x"), start: { a: 0, b: 1 } });
    const lineFit = await exLine.fit();
    expect(lineFit.source.model.formula?.expression).toBe("a + b*x");
    // Ordinary least-squares slope Σ(x − x̄)(y − ȳ) / Σ(x − x̄)² (common practice).
    const mx = 9.5, my = line.y.reduce((a, b) => a + b, 0) / 20;
    let sxy = 0, sxx = 0;
    line.x.forEach((x, i) => { sxy += (x - mx) * (line.y[i] - my); sxx += (x - mx) ** 2; });
    expect(lineFit.params.b.value).toBeCloseTo(sxy / sxx, 8);
  });
});
