// WidgetModel against the Jupyter widget messaging protocol 2.1 (jupyter-widgets
// "messages.md", shipped in npm @jupyter-widgets/schema): comm_open with state, buffer_paths
// and metadata.version; update / echo_update / request_state / custom.
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { typedArraySerializer } from "../../kernel-ext/widget/serializers.js";
import { WidgetModel, WIDGET_PROTOCOL_VERSION } from "../../kernel-ext/widget/model.js";
import { liveWidgetCount, registerWidgetControl } from "../../kernel-ext/widget/registry.js";
import type { Comm } from "../../kernel-ext/comm/types.js";
import { useFakeRuntime, type Published } from "./fakeRuntime.js";

const identity = { modelName: "ProbeModel", modelModule: "fringekit-probe", modelModuleVersion: "0.1.0", viewName: "ProbeView", viewModule: "fringekit-probe", viewModuleVersion: "0.1.0" };
let fake: ReturnType<typeof useFakeRuntime>;
beforeEach(() => (fake = useFakeRuntime()));
afterEach(() => fake.restore());

function make() {
  return new WidgetModel(identity, { value: 1, x: new Float64Array([1, 2]) as Float64Array | null }, { serializers: { x: typedArraySerializer } });
}

/** Delivers a frontend comm_msg to the model's comm, as the kernel would. */
async function fromFrontend(comm: Comm, data: Record<string, unknown>, buffers: DataView[] = []): Promise<void> {
  await fake.runtime.comms.handleMessage({ comm_id: comm.id, data }, buffers, {});
}

const last = (type: string): Published => fake.sent.filter((m) => m.msgType === type).at(-1)!;

describe("WidgetModel", () => {
  it("new WidgetModel(identity, state) opens comm jupyter.widget with state, buffer_paths and version 2.1.0", () => {
    const model = make();
    const open = last("comm_open");
    expect(open.content.target_name).toBe("jupyter.widget");
    expect(open.content.comm_id).toBe(model.id);
    expect(open.metadata).toEqual({ version: WIDGET_PROTOCOL_VERSION });
    const data = open.content.data as { state: Record<string, unknown>; buffer_paths: unknown };
    expect(data.state).toMatchObject({ _model_name: "ProbeModel", _model_module: "fringekit-probe", _model_module_version: "0.1.0", _view_name: "ProbeView", value: 1, x: { dtype: "float64", shape: [2] } });
    expect(data.buffer_paths).toEqual([["x", "buffer"]]);
    expect(open.buffers.length).toBe(1);
    // The protocol document names the comm_open fields this test checks.
    const doc = readFileSync(createRequire(import.meta.url).resolve("@jupyter-widgets/schema/messages.md"), "utf8");
    expect(doc).toContain("buffer_paths");
    expect(liveWidgetCount()).toBeGreaterThan(0);
  });

  it("model.set(changes) sends update with only the changed keys and runs listeners", () => {
    const model = make();
    const seen: unknown[] = [];
    model.onChange((changes, source) => seen.push([changes, source]));
    model.set({ value: 2 });
    expect(last("comm_msg").content.data).toEqual({ method: "update", state: { value: 2 }, buffer_paths: [] });
    expect(seen).toEqual([[{ value: 2 }, "kernel"]]);
    expect(() => model.set({ nope: 1 } as never)).toThrow(/unknown state key\(s\) nope/);
  });

  it("frontend update is applied, deserialised, echoed (echo_update) and reported", async () => {
    const model = make();
    const seen: unknown[] = [];
    model.onChange((changes, source) => seen.push([Object.keys(changes), source]));
    const bytes = new Float64Array([7, 8, 9]);
    await fromFrontend(model.comm, { method: "update", state: { value: 5, x: { dtype: "float64", shape: [3] }, ignored: true }, buffer_paths: [["x", "buffer"]] }, [new DataView(bytes.buffer)]);
    expect(model.get("value")).toBe(5);
    expect(Array.from(model.get("x")!)).toEqual([7, 8, 9]);
    const echo = last("comm_msg");
    expect((echo.content.data as { method: string }).method).toBe("echo_update");
    expect((echo.content.data as { buffer_paths: unknown }).buffer_paths).toEqual([["x", "buffer"]]);
    expect(seen).toEqual([[["value", "x"], "frontend"]]);
  });

  it("request_state is answered with the full state as update", async () => {
    const model = make();
    await fromFrontend(model.comm, { method: "request_state" });
    const data = last("comm_msg").content.data as { method: string; state: Record<string, unknown> };
    expect(data.method).toBe("update");
    expect(Object.keys(data.state)).toEqual(expect.arrayContaining(["_model_name", "value", "x"]));
  });

  it("custom messages travel both ways with buffers", async () => {
    const model = make();
    const got: unknown[] = [];
    model.onCustom((content, buffers) => void got.push([content, buffers.length]));
    await fromFrontend(model.comm, { method: "custom", content: { event: "fit" } }, [new DataView(new ArrayBuffer(4))]);
    expect(got).toEqual([[{ event: "fit" }, 1]]);
    model.sendCustom({ done: true }, [new Uint8Array([1])]);
    expect(last("comm_msg").content.data).toEqual({ method: "custom", content: { done: true } });
    expect(last("comm_msg").buffers.length).toBe(1);
  });

  it("display() publishes display_data with the widget view and text fallbacks", () => {
    const model = make();
    model.display();
    const shown = last("display_data").content.data as Record<string, unknown>;
    expect(shown["application/vnd.jupyter.widget-view+json"]).toEqual({ version_major: 2, version_minor: 0, model_id: model.id });
    expect(typeof shown["text/plain"]).toBe("string");
    expect(typeof shown["text/html"]).toBe("string");
  });

  it("close() sends comm_close once and forgets the model", () => {
    const model = make();
    const before = liveWidgetCount();
    model.close();
    model.close();
    expect(fake.sent.filter((m) => m.msgType === "comm_close").length).toBe(1);
    expect(liveWidgetCount()).toBe(before - 1);
    expect(() => model.set({ value: 3 })).toThrow(/is closed/);
  });

  it("new WidgetModel({modelName: \"\"}) throws naming the field", () => {
    expect(() => new WidgetModel({ ...identity, modelName: "" }, {})).toThrow(/invalid widget identity.modelName/);
  });

  it("request_states on jupyter.widget.control returns every live model's state (protocol 2.1)", async () => {
    const model = make();
    registerWidgetControl();
    await fake.runtime.comms.handleOpen({ comm_id: "ctl", target_name: "jupyter.widget.control", data: {} }, [], {});
    await fake.runtime.comms.handleMessage({ comm_id: "ctl", data: { method: "request_states" } }, [], {});
    const reply = last("comm_msg");
    const data = reply.content.data as { method: string; states: Record<string, { model_name: string; state: Record<string, unknown> }>; buffer_paths: unknown[][] };
    expect(data.method).toBe("update_states");
    expect(data.states[model.id].model_name).toBe("ProbeModel");
    expect(data.states[model.id].state.value).toBe(1);
    expect(data.buffer_paths).toContainEqual([model.id, "state", "x", "buffer"]);
    expect(reply.buffers.length).toBe(data.buffer_paths.length);
  });
});
