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
});
