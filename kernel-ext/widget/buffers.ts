/**
 * Moving binary values between widget state and message buffers, as the Jupyter widget
 * messaging protocol 2.1 describes: binary leaves are taken out of the JSON state and sent as
 * separate frames; `buffer_paths` lists where each one belongs (a list of keys and indices).
 */
import { checkBufferPaths } from "../../widgets/shared/bufferPaths.js";

/** A path into a state object: object keys and array indices. */
export type BufferPath = (string | number)[];

/** State with binary leaves taken out. */
export interface SplitState {
  state: Record<string, unknown>;
  bufferPaths: BufferPath[];
  buffers: ArrayBufferView[];
}

function isBinary(value: unknown): value is ArrayBuffer | ArrayBufferView {
  return value instanceof ArrayBuffer || ArrayBuffer.isView(value);
}

/**
 * Takes binary leaves (ArrayBuffer, typed arrays, DataView) out of `state` without modifying
 * it: object keys holding binary are removed, array entries holding binary become null.
 */
export function removeBuffers(state: Record<string, unknown>): SplitState {
  const bufferPaths: BufferPath[] = [];
  const buffers: ArrayBufferView[] = [];
  const walk = (value: unknown, path: BufferPath): unknown => {
    if (Array.isArray(value)) {
      return value.map((item, index) => {
        if (isBinary(item)) {
          bufferPaths.push([...path, index]);
          buffers.push(asView(item));
          return null;
        }
        return walk(item, [...path, index]);
      });
    }
    if (value !== null && typeof value === "object" && !isBinary(value)) {
      const out: Record<string, unknown> = {};
      for (const [key, item] of Object.entries(value)) {
        if (isBinary(item)) {
          bufferPaths.push([...path, key]);
          buffers.push(asView(item));
        } else {
          out[key] = walk(item, [...path, key]);
        }
      }
      return out;
    }
    return value;
  };
  return { state: walk(state, []) as Record<string, unknown>, bufferPaths, buffers };
}

/**
 * Puts `buffers` back into `state` (in place) at `bufferPaths`, as DataViews.
 * Throws TypeError when a path does not lead into the state through its own properties or
 * holds `__proto__`, `constructor` or `prototype` (checkBufferPaths).
 */
export function putBuffers(state: Record<string, unknown>, bufferPaths: readonly BufferPath[], buffers: readonly DataView[]): void {
  if (bufferPaths.length > buffers.length) {
    throw new TypeError(`buffer_paths lists ${bufferPaths.length} buffers but the message carries ${buffers.length}`);
  }
  checkBufferPaths(bufferPaths); // refuses __proto__, constructor, prototype (prototype pollution)
  bufferPaths.forEach((path, i) => {
    let target: Record<string | number, unknown> = state;
    for (let k = 0; k < path.length - 1; k++) {
      // Own properties only: an inherited one (toString…) is not state.
      const next = Object.prototype.hasOwnProperty.call(target, path[k]!) ? target[path[k]!] : undefined;
      if (next === null || typeof next !== "object") {
        throw new TypeError(`buffer_paths[${i}] ${JSON.stringify(path)} does not lead into the state (stops at ${JSON.stringify(path[k])})`);
      }
      target = next as Record<string | number, unknown>;
    }
    target[path[path.length - 1]] = buffers[i];
  });
}

function asView(value: ArrayBuffer | ArrayBufferView): ArrayBufferView {
  return value instanceof ArrayBuffer ? new DataView(value) : value;
}
