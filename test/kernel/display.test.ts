// The mime-bundle protocol and display helpers (Jupyter messaging spec 5.3: display_data,
// update_display_data with transient.display_id, clear_output).
import { inspect } from "node:util";
import { afterEach, describe, expect, it } from "vitest";
import { clearOutput, display, mimeBundleOf, MIME_BUNDLE, updateDisplay } from "../../kernel-ext/display.js";
import { interruptSignal } from "../../kernel-ext/interrupt.js";
import { NotInKernelError } from "../../kernel-ext/runtime.js";
import { openComm, registerCommTarget } from "../../kernel-ext/comm/api.js";
import { useFakeRuntime } from "./fakeRuntime.js";

let restore: (() => void) | undefined;
afterEach(() => restore?.());

describe("mimeBundleOf(value)", () => {
  it("mimeBundleOf({[MIME_BUNDLE]}) uses the bundle and adds text/plain", () => {
    const value = { [MIME_BUNDLE]: () => ({ "text/html": "<b>V</b>", "application/vnd.plotly.v1+json": { data: [] } }) };
    const { data } = mimeBundleOf(value);
    expect(data["text/html"]).toBe("<b>V</b>");
    expect(data["application/vnd.plotly.v1+json"]).toEqual({ data: [] });
    expect(typeof data["text/plain"]).toBe("string");
  });
  it("mimeBundleOf({toMimeBundle}) keeps the given text/plain", () => {
    expect(mimeBundleOf({ toMimeBundle: () => ({ "text/plain": "V = 0.81(2)", "text/markdown": "**V**" }) }).data).toEqual({ "text/plain": "V = 0.81(2)", "text/markdown": "**V**" });
  });
  it("mimeBundleOf(plain value) is Node's inspect text (common practice: the REPL's view)", () => {
    expect(mimeBundleOf("ab").data).toEqual({ "text/plain": inspect("ab") });
    expect(mimeBundleOf([1, 2]).data["text/plain"]).toBe("[ 1, 2 ]");
  });
  it("mimeBundleOf rejects non-bundles and non-string text entries, naming them", () => {
    expect(() => mimeBundleOf({ toMimeBundle: () => 42 })).toThrow(/expected an object/);
    expect(() => mimeBundleOf({ toMimeBundle: () => ({ "text/html": 1 }) })).toThrow(/text\/html must be a string/);
    expect(() => mimeBundleOf({ toMimeBundle: () => ({ html: "x" }) })).toThrow(/"html" is not a mime type/);
  });
});

describe("display helpers in and out of the kernel", () => {
  it("display(value) outside the kernel throws NotInKernelError with what to do", () => {
    expect(() => display(1)).toThrow(NotInKernelError);
    expect(() => display(1)).toThrow(/fringekit kernel install/);
    expect(() => openComm("t")).toThrow(NotInKernelError);
    expect(interruptSignal().aborted).toBe(false);
  });

  it("display(value, {displayId}) / updateDisplay / clearOutput publish spec messages", () => {
    const fake = useFakeRuntime();
    restore = fake.restore;
    display({ toMimeBundle: () => ({ "text/markdown": "a" }) }, { displayId: "fig" });
    updateDisplay("fig", 3);
    clearOutput(true);
    expect(fake.sent.map((m) => m.msgType)).toEqual(["display_data", "update_display_data", "clear_output"]);
    expect(fake.sent[0].content.transient).toEqual({ display_id: "fig" });
    expect(fake.sent[1].content).toMatchObject({ data: { "text/plain": "3" }, transient: { display_id: "fig" } });
    expect(fake.sent[2].content).toEqual({ wait: true });
  });

  it("interruptSignal() is the kernel's signal of the running cell", () => {
    const fake = useFakeRuntime();
    restore = fake.restore;
    expect(interruptSignal().aborted).toBe(false);
    fake.controller.abort();
    expect(interruptSignal().aborted).toBe(true);
  });
});

describe("comm registry", () => {
  it("registerCommTarget / comm_open / comm_info / comm_close follow the spec", async () => {
    const fake = useFakeRuntime();
    restore = fake.restore;
    const opened: string[] = [];
    const unregister = registerCommTarget("fk.t", (comm, data) => void opened.push(`${comm.id}:${JSON.stringify(data)}`));
    await fake.runtime.comms.handleOpen({ comm_id: "c1", target_name: "fk.t", data: { a: 1 } }, [], {});
    expect(opened).toEqual(['c1:{"a":1}']);
    expect(fake.runtime.comms.info()).toEqual({ status: "ok", comms: { c1: { target_name: "fk.t" } } });
    expect(fake.runtime.comms.info("other")).toEqual({ status: "ok", comms: {} });
    await fake.runtime.comms.handleOpen({ comm_id: "c2", target_name: "nobody", data: {} }, [], {});
    expect(fake.sent.at(-1)).toMatchObject({ msgType: "comm_close", content: { comm_id: "c2" } });
    unregister();
    await fake.runtime.comms.handleOpen({ comm_id: "c3", target_name: "fk.t", data: {} }, [], {});
    expect(fake.sent.at(-1)).toMatchObject({ msgType: "comm_close", content: { comm_id: "c3" } });
    fake.runtime.comms.handleClose({ comm_id: "c1", data: {} });
    expect(fake.runtime.comms.info().comms).toEqual({});
  });

  it("a target handler that throws gets its comm closed and the error rethrown", async () => {
    const fake = useFakeRuntime();
    restore = fake.restore;
    registerCommTarget("fk.bad", () => {
      throw new Error("no thanks");
    });
    await expect(fake.runtime.comms.handleOpen({ comm_id: "b1", target_name: "fk.bad", data: {} }, [], {})).rejects.toThrow("no thanks");
    expect(fake.sent.at(-1)).toMatchObject({ msgType: "comm_close", content: { comm_id: "b1" } });
  });
});
