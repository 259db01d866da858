/**
 * Live widget models of this kernel, for the "jupyter.widget.control" target (protocol 2.1):
 * a frontend that reconnects asks for all states at once with "request_states".
 */
import type { JsonObject } from "../comm/types.js";
import { getRuntime } from "../runtime.js";
import { removeBuffers } from "./buffers.js";

/** Comm target of the widget control channel. */
export const WIDGET_CONTROL_TARGET = "jupyter.widget.control";

/** What the control channel needs from a model. */
export interface TrackedWidget {
  readonly id: string;
  readonly identity: { modelName: string; modelModule: string; modelModuleVersion: string };
  getState(): Record<string, unknown>;
  wireState(keys: readonly string[], withIdentity?: boolean): Record<string, unknown>;
}

const REGISTRY_KEY = Symbol.for("fringekit.kernel.widgets");

function widgets(): Map<string, TrackedWidget> {
  const g = globalThis as Record<symbol, Map<string, TrackedWidget> | undefined>;
  return (g[REGISTRY_KEY] ??= new Map());
}

/** Records a live model. */
export function trackWidget(widget: TrackedWidget): void {
  widgets().set(widget.id, widget);
}

/** Forgets a closed model. */
export function untrackWidget(id: string): void {
  widgets().delete(id);
}

/** Number of live models (for tests and diagnostics). */
export function liveWidgetCount(): number {
  return widgets().size;
}

/**
 * Registers the "jupyter.widget.control" target: on {method: "request_states"} it replies
 * {method: "update_states", states: {id: {model_name, model_module, model_module_version,
 * state}}, buffer_paths: [[id, "state", ...path]...]} with the binary buffers.
 * @returns a function that unregisters the target
 */
export function registerWidgetControl(): () => void {
  const runtime = getRuntime();
  if (!runtime) return () => {};
  return runtime.comms.registerTarget(WIDGET_CONTROL_TARGET, (comm) => {
    comm.onMessage((data: JsonObject) => {
      if (data.method !== "request_states") {
        throw new TypeError(`${WIDGET_CONTROL_TARGET}: unknown method ${JSON.stringify(data.method)} (request_states)`);
      }
      const states: Record<string, unknown> = {};
      for (const widget of widgets().values()) {
        states[widget.id] = {
          model_name: widget.identity.modelName,
          model_module: widget.identity.modelModule,
          model_module_version: widget.identity.modelModuleVersion,
          state: widget.wireState(Object.keys(widget.getState()), true),
        };
      }
      const split = removeBuffers(states);
      comm.send({ method: "update_states", states: split.state, buffer_paths: split.bufferPaths }, {}, split.buffers);
    });
  });
}
