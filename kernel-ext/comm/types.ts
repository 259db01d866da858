/**
 * Types of the Jupyter comm layer (Jupyter messaging specification 5.3, "Custom Messages").
 */
import type { BufferLike } from "../runtime.js";

export type { BufferLike };

/** A JSON object as carried in comm `data` and `metadata`. */
export type JsonObject = Record<string, unknown>;

/** Callback for messages the frontend sends on a comm; `buffers` are the binary frames. */
export type CommMessageListener = (data: JsonObject, buffers: DataView[], metadata: JsonObject) => void | Promise<void>;

/** Callback for the closing of a comm by either side. */
export type CommCloseListener = (data: JsonObject) => void;

/** One end of a comm: a channel between kernel code and a frontend object. */
export interface Comm {
  /** comm_id (a widget's model_id). */
  readonly id: string;
  /** The target the comm was opened with. */
  readonly targetName: string;
  /** True after either side closed it. */
  readonly closed: boolean;
  /** Sends comm_msg with `data` and optional binary `buffers` (each one frame on the wire). */
  send(data: JsonObject, metadata?: JsonObject, buffers?: readonly BufferLike[]): void;
  /** Sends comm_close (once) and forgets the comm; close listeners run. */
  close(data?: JsonObject, metadata?: JsonObject): void;
  /** Adds a listener for comm_msg from the frontend; returns a function that removes it. */
  onMessage(listener: CommMessageListener): () => void;
  /** Adds a listener for the comm's closing (by either side); returns a remover. */
  onClose(listener: CommCloseListener): () => void;
}

/**
 * Called when a frontend opens a comm to a registered target. `data` and `buffers` are the
 * comm_open payload. Throwing closes the comm.
 */
export type CommTargetHandler = (comm: Comm, data: JsonObject, buffers: DataView[], metadata: JsonObject) => void | Promise<void>;
