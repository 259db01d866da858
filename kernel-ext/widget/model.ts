/**
 * Kernel-side widget model base, Jupyter widget messaging protocol 2.1: the kernel opens a comm
 * to target "jupyter.widget" with the full state; both sides then send "update" messages with
 * changed keys; the kernel answers a frontend "update" with "echo_update", answers
 * "request_state" with the full state, and "custom" messages travel both ways.
 */
import { openComm } from "../comm/api.js";
import type { Comm, JsonObject } from "../comm/types.js";
import type { MimeBundle } from "../display.js";
import { display, MIME_BUNDLE } from "../display.js";
import type { BufferLike } from "../runtime.js";
import { putBuffers, removeBuffers, type BufferPath } from "./buffers.js";
import type { Serializer } from "./serializers.js";
import { trackWidget, untrackWidget } from "./registry.js";

/** Widget protocol version sent in comm_open metadata (kept apart from the package version). */
export const WIDGET_PROTOCOL_VERSION = "2.1.0";
/** Comm target of widget models. */
export const WIDGET_COMM_TARGET = "jupyter.widget";
/** Mime type of a widget view in display_data. */
export const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";

/** Which frontend classes render the model (the `_model_*` and `_view_*` state keys). */
export interface WidgetIdentity {
  modelName: string;
  modelModule: string;
  modelModuleVersion: string;
  viewName?: string | null;
  viewModule?: string | null;
  viewModuleVersion?: string;
}

/** Where a change came from. */
export type ChangeSource = "kernel" | "frontend";

/** Listener for state changes: `changes` holds the new values of changed keys. */
export type ChangeListener<S> = (changes: Partial<S>, source: ChangeSource) => void;

/** Listener for custom messages from the frontend. */
export type CustomListener = (content: unknown, buffers: DataView[]) => void | Promise<void>;

/** Options of a widget model. */
export interface WidgetModelOptions<S> {
  /**
   * Serialisers per state key, e.g. `{ x: typedArraySerializer }` for binary arrays. Typed
   * loosely so one serialiser serves every typed-array type a key may hold.
   */
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  serializers?: { [K in keyof S]?: Serializer<any> };
}

/**
 * A widget model living in the kernel, synchronised with its frontend twin over a comm.
 * Subclass it (or use it directly) with the state shape `S`. Creating it opens the comm.
 * Example: `const m = new WidgetModel({modelName: "CounterModel", modelModule: "fringekit",
 * modelModuleVersion: "0.1.0"}, {count: 0}); m.onChange((c) => ...); m.display();`
 */
export class WidgetModel<S extends Record<string, unknown>> {
  /** The comm carrying this model; its id is the model_id. */
  readonly comm: Comm;
  readonly identity: WidgetIdentity;
  private state: S;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  private readonly serializers: { [K in keyof S]?: Serializer<any> };
  private readonly changeListeners = new Set<ChangeListener<S>>();
  private readonly customListeners = new Set<CustomListener>();

  /**
   * @param identity frontend model/view names, modules and versions
   * @param initialState every synchronised key with its initial value
   */
  constructor(identity: WidgetIdentity, initialState: S, options: WidgetModelOptions<S> = {}) {
    for (const key of ["modelName", "modelModule", "modelModuleVersion"] as const) {
      if (typeof identity?.[key] !== "string" || identity[key] === "") {
        throw new TypeError(`invalid widget identity.${key}: ${JSON.stringify(identity?.[key])} (a non-empty string)`);
      }
    }
    this.identity = identity;
    this.state = { ...initialState };
    this.serializers = options.serializers ?? {};
    const { state, bufferPaths, buffers } = removeBuffers(this.wireState(Object.keys(this.state), true));
    this.comm = openComm(WIDGET_COMM_TARGET, { state, buffer_paths: bufferPaths }, { version: WIDGET_PROTOCOL_VERSION }, buffers);
    this.comm.onMessage((data, messageBuffers) => this.handleMessage(data, messageBuffers));
    this.comm.onClose(() => untrackWidget(this.id));
    trackWidget(this);
  }

  /** The model_id (the comm id). */
  get id(): string {
    return this.comm.id;
  }

  /** Current value of `key`. */
  get<K extends keyof S>(key: K): S[K] {
    return this.state[key];
  }

  /** A shallow copy of the whole state. */
  getState(): S {
    return { ...this.state };
  }

  /** Sets keys, sends them to the frontend ("update") and runs change listeners. */
  set(changes: Partial<S>): void {
    const keys = Object.keys(changes).filter((key) => this.isKnown(key));
    const unknown = Object.keys(changes).filter((key) => !this.isKnown(key));
    if (unknown.length > 0) throw new TypeError(`widget ${this.identity.modelName}: unknown state key(s) ${unknown.join(", ")}`);
    if (keys.length === 0) return;
    this.state = { ...this.state, ...changes };
    this.sendState("update", keys);
    this.emitChange(changes, "kernel");
  }

  /** Adds a change listener; returns a function that removes it. */
  onChange(listener: ChangeListener<S>): () => void {
    this.changeListeners.add(listener);
    return () => this.changeListeners.delete(listener);
  }

  /** Adds a listener for custom messages from the frontend; returns a remover. */
  onCustom(listener: CustomListener): () => void {
    this.customListeners.add(listener);
    return () => this.customListeners.delete(listener);
  }

  /** Sends a custom message ({method: "custom", content}) with optional binary buffers. */
  sendCustom(content: unknown, buffers: readonly BufferLike[] = []): void {
    this.comm.send({ method: "custom", content }, {}, buffers);
  }

  /** The display bundle of a view of this model (widget view plus text fallbacks). */
  viewBundle(): MimeBundle & { "text/plain": string } {
    const name = this.identity.modelName.replace(/Model$/, "");
    return {
      [WIDGET_VIEW_MIME]: { version_major: 2, version_minor: 0, model_id: this.id },
      "text/plain": `${name}(model_id=${this.id})`,
      "text/html": `<p>${escapeHtml(name)} widget: shown in a Jupyter frontend with the ${escapeHtml(this.identity.modelModule)} widgets installed.</p>`,
    };
  }

  /** The mime-bundle protocol, so a model as a cell's last value shows its view. */
  [MIME_BUNDLE](): MimeBundle {
    return this.viewBundle();
  }

  /** Shows a view of this model in the current cell's output. */
  display(): void {
    display(this);
  }

  /** Closes the comm; the frontend view goes away. */
  close(): void {
    this.comm.close();
  }

  /**
   * The state keys in wire form: serialisers applied, plus the protocol's `_model_*`/`_view_*`
   * keys when `withIdentity`.
   */
  wireState(keys: readonly string[], withIdentity = false): Record<string, unknown> {
    const out: Record<string, unknown> = {};
    if (withIdentity) {
      const id = this.identity;
      Object.assign(out, {
        _model_name: id.modelName,
        _model_module: id.modelModule,
        _model_module_version: id.modelModuleVersion,
        _view_name: id.viewName ?? null,
        _view_module: id.viewModule ?? null,
        _view_module_version: id.viewModuleVersion ?? "",
      });
    }
    for (const key of keys) {
      const serializer = this.serializers[key as keyof S];
      const value = this.state[key];
      out[key] = serializer ? serializer.serialize(value as S[keyof S]) : value;
    }
    return out;
  }

  private isKnown(key: string): boolean {
    return Object.prototype.hasOwnProperty.call(this.state, key);
  }

  private sendState(method: "update" | "echo_update", keys: readonly string[], withIdentity = false): void {
    const { state, bufferPaths, buffers } = removeBuffers(this.wireState(keys, withIdentity));
    this.comm.send({ method, state, buffer_paths: bufferPaths }, {}, buffers);
  }

  private async handleMessage(data: JsonObject, buffers: DataView[]): Promise<void> {
    switch (data.method) {
      case "update":
        return this.handleUpdate(data, buffers);
      case "request_state":
        return this.sendState("update", Object.keys(this.state), true);
      case "custom":
        for (const listener of [...this.customListeners]) await listener(data.content, buffers);
        return;
      default:
        throw new TypeError(`widget ${this.identity.modelName}: unknown method ${JSON.stringify(data.method)} (update, request_state, custom)`);
    }
  }

  private handleUpdate(data: JsonObject, buffers: DataView[]): void {
    const wire = (data.state ?? {}) as Record<string, unknown>;
    putBuffers(wire, (data.buffer_paths ?? []) as BufferPath[], buffers);
    const changes: Partial<S> = {};
    for (const [key, value] of Object.entries(wire)) {
      if (!this.isKnown(key)) continue;
      const serializer = this.serializers[key as keyof S];
      changes[key as keyof S] = (serializer ? serializer.deserialize(value) : value) as S[keyof S];
    }
    const keys = Object.keys(changes);
    if (keys.length === 0) return;
    this.state = { ...this.state, ...changes };
    // Protocol 2.1: echo the accepted values so other frontends and the sender converge.
    this.sendState("echo_update", keys);
    this.emitChange(changes, "frontend");
  }

  private emitChange(changes: Partial<S>, source: ChangeSource): void {
    for (const listener of [...this.changeListeners]) listener(changes, source);
  }
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
