// The explorer works for every model the browser can build by id: it opens with exactly that
// model's parameters and its Fit fits that model (the model shown is the model fitted).
import { afterEach, describe, expect, it } from "vitest";
import { getModel, paramVector, pixelPositions, simulateProfile } from "../../src/advanced.js";
import { browserModelIds, explorer } from "../../kernel-ext/widgets/explorer.js";
import { installFakeKernel } from "./fakeKernel.js";

let kernel: ReturnType<typeof installFakeKernel> | null = null;
afterEach(() => {
  kernel?.uninstall();
  kernel = null;
});

/** Every model of the explorer's menu. */
const ids = browserModelIds("two-slit");

describe("explorer(profile, { model: id }) for every model of its menu", () => {
  it("the menu offers the detector models (two-slit, n-slit, the near-field and broadband ones)", () => {
    expect(ids).toEqual(expect.arrayContaining(["two-slit", "n-slit", "two-slit-fresnel", "two-slit-broadband-wavelength"]));
  });
  for (const id of ids) {
    it(`explorer(p, { model: "${id}" }) opens with ${id}'s parameters and .fit() fits ${id}`, async () => {
      kernel = installFakeKernel();
      const model = getModel(id);
      // The model's own default values on a 2 mm wide line of 400 pixels (5 µm).
      const profile = simulateProfile(model, paramVector(model, {}), pixelPositions(400, 5e-6, -1e-3), { noise: "poisson", seed: 9 });
      const ex = explorer(profile, { model: id });
      expect(Object.keys(ex.params).sort()).toEqual(model.parameters.map((p) => p.name).sort());
      expect(ex.widget.get("model_id")).toBe(id);
      const fit = await ex.fit();
      expect(fit.modelId).toBe(id);
      expect(fit.parameters.map((p) => p.name)).toEqual(model.parameters.map((p) => p.name));
      expect(fit.statistics.n).toBe(400);
    });
  }
});
