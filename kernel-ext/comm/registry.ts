/**
 * Comm bookkeeping for the kernel side: targets, open comms, and the handling of comm_open,
 * comm_msg, comm_close and comm_info_request from frontends (Jupyter messaging spec 5.3).
 */
import { randomUUID } from "node:crypto";
import type { PublishOptions } from "../runtime.js";
import type { BufferLike, Comm, CommCloseListener, CommMessageListener, CommTargetHandler, JsonObject } from "./types.js";

/** Sends one iopub message with the current request as parent. */
export type Publish = (msgType: string, content: Record<string, unknown>, options?: PublishOptions) => void;

/** Where the registry reports problems it cannot send to a frontend (the kernel's log). */
export type LogProblem = (message: string) => void;

class CommImpl implements Comm {
  closed = false;
  private readonly messageListeners = new Set<CommMessageListener>();
  private readonly closeListeners = new Set<CommCloseListener>();

  constructor(
    readonly id: string,
    readonly targetName: string,
    private readonly registry: CommRegistry,
  ) {}

  send(data: JsonObject, metadata: JsonObject = {}, buffers: readonly BufferLike[] = []): void {
    if (this.closed) throw new Error(`comm ${this.id} (${this.targetName}) is closed; open a new one to send`);
    this.registry.publish("comm_msg", { comm_id: this.id, data }, { metadata, buffers });
  }

  close(data: JsonObject = {}, metadata: JsonObject = {}): void {
    if (this.closed) return;
    this.registry.publish("comm_close", { comm_id: this.id, data }, { metadata });
    this.closedBy(data);
  }

  onMessage(listener: CommMessageListener): () => void {
    this.messageListeners.add(listener);
    return () => this.messageListeners.delete(listener);
  }

  onClose(listener: CommCloseListener): () => void {
    this.closeListeners.add(listener);
    return () => this.closeListeners.delete(listener);
  }

  /** Runs message listeners one after another; the first failure is rethrown after all ran. */
  async deliver(data: JsonObject, buffers: DataView[], metadata: JsonObject): Promise<void> {
    let failure: unknown;
    for (const listener of [...this.messageListeners]) {
      try {
        await listener(data, buffers, metadata);
      } catch (error) {
        failure ??= error;
      }
    }
    if (failure !== undefined) throw failure;
  }

  closedBy(data: JsonObject): void {
    if (this.closed) return;
    this.closed = true;
    this.registry.forget(this.id);
    for (const listener of [...this.closeListeners]) {
      try {
        listener(data);
      } catch (error) {
        this.registry.logProblem(`comm ${this.id}: close listener failed: ${String(error)}`);
      }
    }
  }
}

/** Targets and open comms of one kernel. */
export class CommRegistry {
  private readonly targets = new Map<string, CommTargetHandler>();
  private readonly comms = new Map<string, CommImpl>();

  constructor(
    readonly publish: Publish,
    readonly logProblem: LogProblem,
  ) {}

  /** Registers `handler` for comm_open requests to `name`; returns a function that unregisters it. */
  registerTarget(name: string, handler: CommTargetHandler): () => void {
    if (typeof name !== "string" || name === "") throw new TypeError(`invalid comm target name: ${JSON.stringify(name)} (a non-empty string)`);
    if (typeof handler !== "function") throw new TypeError(`invalid handler for comm target ${name}: expected a function`);
    this.targets.set(name, handler);
    return () => {
      if (this.targets.get(name) === handler) this.targets.delete(name);
    };
  }

  /** Opens a comm from the kernel: sends comm_open to `targetName` in the frontend. */
  open(targetName: string, data: JsonObject = {}, metadata: JsonObject = {}, buffers: readonly BufferLike[] = [], commId: string = randomUUID().replaceAll("-", "")): Comm {
    if (typeof targetName !== "string" || targetName === "") throw new TypeError(`invalid comm target name: ${JSON.stringify(targetName)} (a non-empty string)`);
    if (this.comms.has(commId)) throw new Error(`comm id ${commId} is already open`);
    const comm = new CommImpl(commId, targetName, this);
    this.comms.set(commId, comm);
    this.publish("comm_open", { comm_id: commId, target_name: targetName, data }, { metadata, buffers });
    return comm;
  }

  /** The open comm with this id, if any. */
  get(commId: string): Comm | undefined {
    return this.comms.get(commId);
  }

  /** comm_info_reply content: open comms, only those of `targetName` when given. */
  info(targetName?: string): { status: "ok"; comms: Record<string, { target_name: string }> } {
    const comms: Record<string, { target_name: string }> = {};
    for (const comm of this.comms.values()) {
      if (targetName === undefined || targetName === null || comm.targetName === targetName) {
        comms[comm.id] = { target_name: comm.targetName };
      }
    }
    return { status: "ok", comms };
  }

  /** Handles comm_open from a frontend. Unknown targets get a comm_close back (as ipykernel does). */
  async handleOpen(content: JsonObject, buffers: DataView[], metadata: JsonObject): Promise<void> {
    const commId = content.comm_id;
    const targetName = content.target_name;
    if (typeof commId !== "string" || typeof targetName !== "string") {
      this.logProblem(`comm_open without string comm_id and target_name: ${JSON.stringify(content).slice(0, 200)}`);
      return;
    }
    const handler = this.targets.get(targetName);
    if (!handler) {
      this.logProblem(`comm_open to unknown target ${JSON.stringify(targetName)}; closing comm ${commId}`);
      this.publish("comm_close", { comm_id: commId, data: {} });
      return;
    }
    const comm = new CommImpl(commId, targetName, this);
    this.comms.set(commId, comm);
    try {
      await handler(comm, asObject(content.data), buffers, metadata);
    } catch (error) {
      comm.close();
      throw error;
    }
  }

  /** Handles comm_msg from a frontend; unknown comm ids are logged and ignored. */
  async handleMessage(content: JsonObject, buffers: DataView[], metadata: JsonObject): Promise<void> {
    const comm = typeof content.comm_id === "string" ? this.comms.get(content.comm_id) : undefined;
    if (!comm) {
      this.logProblem(`comm_msg for unknown comm ${JSON.stringify(content.comm_id)} ignored`);
      return;
    }
    await comm.deliver(asObject(content.data), buffers, metadata);
  }

  /** Handles comm_close from a frontend. */
  handleClose(content: JsonObject): void {
    const comm = typeof content.comm_id === "string" ? this.comms.get(content.comm_id) : undefined;
    if (!comm) {
      this.logProblem(`comm_close for unknown comm ${JSON.stringify(content.comm_id)} ignored`);
      return;
    }
    comm.closedBy(asObject(content.data));
  }

  /** Removes a closed comm. */
  forget(commId: string): void {
    this.comms.delete(commId);
  }
}

function asObject(value: unknown): JsonObject {
  return value !== null && typeof value === "object" && !Array.isArray(value) ? (value as JsonObject) : {};
}
