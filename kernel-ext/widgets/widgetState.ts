/**
 * Widget state in the notebook-metadata form (@jupyter-widgets/schema v2, "application/
 * vnd.jupyter.widget-state+json"): the latest state of every model, binary buffers in base64.
 * Built from a kernel's comm messages, as nbclient does when it executes a notebook.
 */

/** A comm message as published on iopub. */
export interface CommMessage {
  msgType: string;
  content: Record<string, any>;
  buffers: readonly ArrayBufferView[];
}

/** v2 widget state document. */
export interface WidgetStateDocument {
  version_major: 2;
  version_minor: 0;
  state: Record<string, {
    model_name: string;
    model_module: string;
    model_module_version: string;
    state: Record<string, unknown>;
    buffers?: { path: (string | number)[]; data: string; encoding: "base64" }[];
  }>;
}

const base64 = (view: ArrayBufferView) => Buffer.from(view.buffer, view.byteOffset, view.byteLength).toString("base64");

/**
 * Fold comm_open / comm_msg(update, echo_update) / comm_close messages into the latest state of
 * each jupyter.widget model; closed models are dropped.
 */
export function widgetStateFromMessages(messages: readonly CommMessage[]): WidgetStateDocument {
  const models = new Map<string, { state: Record<string, unknown>; buffers: Map<string, { path: (string | number)[]; data: string }> }>();
  const apply = (id: string, data: Record<string, any>, buffers: readonly ArrayBufferView[]) => {
    const model = models.get(id);
    if (!model) return;
    for (const [key, value] of Object.entries(data.state ?? {})) {
      model.state[key] = value;
      for (const path of [...model.buffers.keys()]) if (JSON.parse(path)[0] === key) model.buffers.delete(path);
    }
    (data.buffer_paths ?? []).forEach((path: (string | number)[], i: number) => {
      model.buffers.set(JSON.stringify(path), { path, data: base64(buffers[i]!) });
    });
  };
  for (const m of messages) {
    const id = m.content.comm_id as string;
    if (m.msgType === "comm_open" && m.content.target_name === "jupyter.widget") {
      models.set(id, { state: {}, buffers: new Map() });
      apply(id, m.content.data ?? {}, m.buffers);
    } else if (m.msgType === "comm_msg" && ["update", "echo_update"].includes(m.content.data?.method)) {
      apply(id, m.content.data, m.buffers);
    } else if (m.msgType === "comm_close") {
      models.delete(id);
    }
  }
  const state: WidgetStateDocument["state"] = {};
  for (const [id, model] of models) {
    state[id] = {
      model_name: String(model.state._model_name),
      model_module: String(model.state._model_module),
      model_module_version: String(model.state._model_module_version ?? ""),
      state: model.state,
      buffers: [...model.buffers.values()].map((b) => ({ ...b, encoding: "base64" as const })),
    };
  }
  return { version_major: 2, version_minor: 0, state };
}
