// Widget views in headless Chromium against the offline pages' widget manager with no kernel.
import { readFile } from "node:fs/promises";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getModel } from "../../src/physics/index.js";
import { hasChromium } from "./browser.js";
import { openHarness, type HarnessPage } from "./page.js";

const run = hasChromium() ? describe : describe.skip;
if (!hasChromium()) console.warn("test/widgets: /usr/bin/chromium not installed; browser tests skipped (apt-get install chromium)");

run("widget views in Chromium", () => {
  let h: HarnessPage;
  beforeAll(async () => {
    h = await openHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  async function show(model: string, stateExpr: string): Promise<string> {
    const id = (await h.page.evaluate(`fk.show(${JSON.stringify(model)}, ${stateExpr})`)) as string;
    await h.page.waitForSelector(`#host-${id} .js-plotly-plot .main-svg`, { state: "attached" });
    return id;
  }

  it("ExplorerView.render() draws the profile and one keyboard-operable slider per parameter", async () => {
    const id = await show("ExplorerModel", "fk.b1State(4096)");
    const names = await h.page.$$eval(`#host-${id} input[type=range]`, (els) => els.map((e) => e.getAttribute("data-param")));
    expect(names).toEqual(getModel("two-slit").parameters.map((p) => p.name));
    const points = await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).plotEl.data[0].x.length`);
    expect(points).toBe(4096);
    expect(h.errors).toEqual([]);
  });

  it("ArrowRight on a slider recomputes the curve in the browser with the kernel's physics code", async () => {
    const id = await show("ExplorerModel", "fk.b1State(1024)");
    const slider = h.page.locator(`#host-${id} input[type=range][data-param="separation"]`);
    const before = (await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).liveParams.separation.value`)) as number;
    const canvasBefore = await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).overlay.toDataURL()`);
    await slider.focus();
    for (let k = 0; k < 10; k++) await slider.press("ArrowRight");
    await h.page.waitForTimeout(100);
    const snapshot = (await h.page.evaluate(`(() => { const v = fk.views.get(${JSON.stringify(id)});
      return { params: v.liveParams, x: Array.from(v.model.get("x").data), curve: Array.from(v.curve), canvas: v.overlay.toDataURL() }; })()`)) as
      { params: Record<string, { value: number }>; x: number[]; curve: number[]; canvas: string };
    // Each key press moves 1/1000 of the range value ± |value| and the range re-centres on
    // the settled value, so ten presses scale the value by 1.002^10.
    expect(snapshot.params.separation!.value / before).toBeCloseTo(1.002 ** 10, 9);
    expect(snapshot.canvas).not.toBe(canvasBefore);
    // Same result as evaluating src/physics here in Node (the kernel's side) for those values.
    const model = getModel("two-slit");
    const params = Float64Array.from(model.parameters, (p) => snapshot.params[p.name]!.value);
    const expected = new Float64Array(snapshot.x.length);
    model.evaluate(Float64Array.from(snapshot.x), params, expected);
    for (let i = 0; i < expected.length; i += 37) expect(snapshot.curve[i]).toBeCloseTo(expected[i]!, 9);
  });

  it("dragging across the plot in Mask mode excludes that region; Window sets the fit window; Clear removes both", async () => {
    const id = await show("ExplorerModel", "fk.b1State(2048)");
    const host = `#host-${id}`;
    await h.page.locator(`${host} .js-plotly-plot`).scrollIntoViewIfNeeded();
    const box = (await h.page.evaluate(`(() => { const p = fk.views.get(${JSON.stringify(id)}).plotEl; const r = p.getBoundingClientRect();
      const xa = p._fullLayout.xaxis, ya = p._fullLayout.yaxis;
      return { left: r.left + xa._offset, width: xa._length, top: r.top + ya._offset, height: ya._length, p2l: [xa.p2l(0.3 * xa._length), xa.p2l(0.5 * xa._length)] }; })()`)) as
      { left: number; width: number; top: number; height: number; p2l: [number, number] };
    await h.page.click(`${host} button[data-mode=mask]`);
    const y = box.top + box.height / 2;
    await h.page.mouse.move(box.left + 0.3 * box.width, y);
    await h.page.mouse.down();
    await h.page.mouse.move(box.left + 0.4 * box.width, y, { steps: 5 });
    await h.page.mouse.move(box.left + 0.5 * box.width, y, { steps: 5 });
    await h.page.mouse.up();
    await h.page.waitForTimeout(300);
    const ranges = (await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).model.get("masked_ranges")`)) as [number, number][];
    expect(ranges).toHaveLength(1);
    // Plot x is in mm: the masked range (m) is the dragged span, to within a pixel.
    const pixel = (box.p2l[1] - box.p2l[0]) / (0.2 * box.width) / 1e3;
    expect(Math.abs(ranges[0]![0] - box.p2l[0] / 1e3)).toBeLessThan(2 * pixel);
    expect(Math.abs(ranges[0]![1] - box.p2l[1] / 1e3)).toBeLessThan(2 * pixel);
    const excluded = (await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).plotEl.data[1].y.filter((v) => Number.isFinite(v)).length`)) as number;
    expect(excluded).toBeGreaterThan(100);

    await h.page.click(`${host} button[data-mode=window]`);
    await h.page.mouse.move(box.left + 0.1 * box.width, y);
    await h.page.mouse.down();
    await h.page.mouse.move(box.left + 0.9 * box.width, y, { steps: 8 });
    await h.page.mouse.up();
    await h.page.waitForTimeout(300);
    expect(await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).model.get("window")`)).not.toBeNull();
    await h.page.click(`${host} button[data-action=clear-mask]`);
    await h.page.waitForTimeout(200);
    expect(await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).model.get("masked_ranges").length`)).toBe(0);
    expect(await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).model.get("window")`)).toBeNull();
  });

  it("the SVG export action downloads the figure including the live model curve", async () => {
    const id = await show("ExplorerModel", "fk.b1State(512)");
    const [download] = await Promise.all([h.page.waitForEvent("download"), h.page.click(`#host-${id} button[data-action=export-svg]`)]);
    expect(download.suggestedFilename()).toBe("fringekit-explorer-two-slit.svg");
    const svg = await readFile((await download.path())!, "utf8");
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).toContain("model (sliders)");
    // The live curve was a real 512-point path in the exported figure (one path, in the first series colour) ...
    expect((svg.match(/<path d="M[^"]{1000,}" fill="none" stroke="#143d73"/g) ?? []).length).toBeGreaterThanOrEqual(1);
    // ... and the on-screen figure is back to its canvas-drawn live layer.
    expect(await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).plotEl.data[2].y.length`)).toBe(1);
  });

  it("Fit with no kernel and no in-page fitter explains what to do", async () => {
    const id = await show("ExplorerModel", "fk.b1State(256)");
    await h.page.click(`#host-${id} button[data-action=fit]`);
    await h.page.waitForTimeout(100);
    expect(await h.page.textContent(`#host-${id} .fk-status`)).toMatch(/open this notebook in Jupyter/);
  });

  it("ExplorerView draws nothing before it is in the page, then once at the page's width", async () => {
    const drawn = (await h.page.evaluate(`(async () => {
      const model = await fk.manager.new_model({ model_name: "ExplorerModel", model_module: fk.widgetModule.MODULE_NAME,
        model_module_version: fk.widgetModule.MODULE_VERSION, model_id: "detached-view" }, fk.b1State(1024));
      const view = await fk.manager.create_view(model);
      const beforeShown = view.plotEl.childElementCount;
      const host = document.body.appendChild(Object.assign(document.createElement("div"), { id: "host-detached-view" }));
      const first = new Promise((resolve) => view.el.addEventListener("fk-redraw", () =>
        resolve({ figureWidth: view.plotEl._fullLayout.width, plotWidth: view.plotEl.clientWidth }), { once: true }));
      await fk.manager.display_view(view, host);
      return { beforeShown, ...(await first) };
    })()`)) as { beforeShown: number; figureWidth: number; plotWidth: number };
    expect(drawn.beforeShown).toBe(0);
    expect(drawn.plotWidth).toBeGreaterThan(300);
    expect(drawn.figureWidth).toBe(drawn.plotWidth);
  });

  it("ExplorerView paints the data markers under the figure; hover reads a point; the legend hides them", async () => {
    const id = await show("ExplorerModel", "fk.b1State(1024)");
    const host = `#host-${id}`;
    const view = `fk.views.get(${JSON.stringify(id)})`;
    const painted = () => h.page.evaluate(`(() => { const c = ${view}.dataLayer;
      const pixels = c.getContext("2d").getImageData(0, 0, c.width, c.height).data;
      let n = 0; for (let i = 3; i < pixels.length; i += 4) if (pixels[i] > 0) n++; return n; })()`) as Promise<number>;
    expect(await painted()).toBeGreaterThan(1024);
    expect(await h.page.evaluate(`${view}.plotEl._fullLayout.plot_bgcolor`)).toBe("rgba(0,0,0,0)");
    // Hover over the highest point: plotly still finds it (the points stay as invisible markers).
    const point = (await h.page.evaluate(`(() => { const gd = ${view}.plotEl; gd.scrollIntoView();
      const layout = gd._fullLayout, data = gd._fullData[0]; let best = 0;
      for (let i = 0; i < data.y.length; i++) if (data.y[i] > data.y[best]) best = i;
      const box = gd.getBoundingClientRect();
      return { x: box.left + layout.xaxis._offset + layout.xaxis.l2p(data.x[best]), y: box.top + layout.yaxis._offset + layout.yaxis.l2p(data.y[best]), index: best }; })()`)) as { x: number; y: number; index: number };
    await h.page.mouse.move(point.x - 20, point.y + 20);
    await h.page.mouse.move(point.x, point.y, { steps: 5 });
    // Neighbours less than a marker apart may win "closest": a point within a few of the highest.
    await h.page.waitForFunction(`${view}.plotEl._hoverdata?.[0]?.curveNumber === 0 && Math.abs(${view}.plotEl._hoverdata[0].pointNumber - ${point.index}) <= 5`, null, { timeout: 5000 });
    expect(await h.page.textContent(`${host} .hoverlayer`)).toMatch(/\(.+, .+\)/); // "(x, y)" label shown
    await h.page.mouse.move(0, 0);
    await h.page.locator(`${host} .legend .traces`).filter({ hasText: /^data$/ }).click();
    await h.page.waitForFunction(`${view}.plotEl._fullData[0].visible === "legendonly"`);
    await h.page.waitForTimeout(100);
    expect(await painted()).toBe(0);
    expect(h.errors).toEqual([]);
  });

  it("view.remove() purges the plot and stops listening to the model", async () => {
    const id = await show("ExplorerModel", "fk.b1State(256)");
    const left = (await h.page.evaluate(`(() => { const v = fk.views.get(${JSON.stringify(id)}); const m = v.model;
      v.remove();
      m.set("params", { ...m.get("params") });
      return { plotted: v.plotEl.querySelector(".main-svg") !== null, layout: v.plotEl._fullLayout !== undefined,
        listeners: Object.keys(m._events || {}).filter((k) => (m._events[k] || []).some((e) => e.ctx === v)).length,
        inDom: document.body.contains(v.el) }; })()`)) as Record<string, unknown>;
    expect(left).toEqual({ plotted: false, layout: false, listeners: 0, inDom: false });
    expect(h.errors).toEqual([]);
  });

  it("ComparisonView shows every fit, its residuals and the table with the verdict", async () => {
    const id = await show("ComparisonModel", "fk.comparisonState(1024)");
    const rows = await h.page.$$eval(`#host-${id} [data-region=comparison-table] tbody tr`, (els) => els.length);
    expect(rows).toBe(3);
    expect(await h.page.textContent(`#host-${id} [data-region=verdict]`)).toContain("preferred");
    const traces = await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).plotEl.data.length`);
    expect(traces).toBe(1 + 2 * 3);
  });

  it("UncertaintyView draws one profile panel per parameter and the correlation matrix", async () => {
    const id = await show("UncertaintyModel", "fk.uncertaintyState()");
    const v = JSON.stringify(id);
    expect(await h.page.evaluate(`fk.views.get(${v}).plotEl.data.length`)).toBe(4);
    await h.page.waitForSelector(`#host-${id} [data-region=correlation] .heatmaplayer`, { state: "attached" });
    expect(await h.page.$$eval(`#host-${id} [data-region=intervals] tbody tr`, (els) => els.length)).toBe(4);
  });

  it("CoherenceScanView plots visibility against separation with error bars, model and band", async () => {
    const id = await show("CoherenceScanModel", "fk.coherenceState()");
    const kinds = (await h.page.evaluate(`fk.views.get(${JSON.stringify(id)}).plotEl.data.map((t) => t.name || "")`)) as string[];
    expect(kinds).toContain("measured");
    expect(kinds).toContain("confidence band");
    expect(await h.page.textContent(`#host-${id} [data-quantity=rmsSize]`)).toMatch(/120\.\d ± 3\.\d/);
    expect(h.errors).toEqual([]);
  });
});
