// Binary arrays in widget state ({dtype, shape, buffer}, little-endian) and buffer extraction
// (jupyter-widgets messaging protocol 2.1: buffer_paths). Byte layouts are compared with
// Python's struct module (IEEE 754 little-endian doubles).
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { putBuffers, removeBuffers } from "../../kernel-ext/widget/buffers.js";
import { fromWireArray, ndArraySerializer, toWireArray, typedArraySerializer } from "../../kernel-ext/widget/serializers.js";
import { python } from "./helpers.js";

const hasPython = spawnSync(python, ["-c", "pass"]).status === 0;
function pythonBytes(expression: string): Buffer {
  const run = spawnSync(python, ["-c", `import struct, sys; sys.stdout.buffer.write(${expression})`]);
  if (run.status !== 0) throw new Error(String(run.stderr));
  return run.stdout;
}

describe("typed array serialisers", () => {
  it.skipIf(!hasPython)("typedArraySerializer.serialize(Float64Array) has struct.pack('<3d') bytes", () => {
    const wire = typedArraySerializer.serialize(new Float64Array([0.5, -1.25, 6.02214076e23])) as { dtype: string; shape: number[]; buffer: DataView };
    expect(wire.dtype).toBe("float64");
    expect(wire.shape).toEqual([3]);
    const bytes = Buffer.from(wire.buffer.buffer, wire.buffer.byteOffset, wire.buffer.byteLength);
    expect(bytes.equals(pythonBytes("struct.pack('<3d', 0.5, -1.25, 6.02214076e23)"))).toBe(true);
  });

  it.skipIf(!hasPython)("fromWireArray reads struct.pack('<4i') bytes at an odd offset", () => {
    const raw = pythonBytes("struct.pack('<4i', 1, -2, 2147483647, -2147483648)");
    const shifted = Buffer.concat([Buffer.from([9]), raw]);
    const nd = fromWireArray({ dtype: "int32", shape: [2, 2], buffer: new DataView(shifted.buffer, shifted.byteOffset + 1, raw.length) });
    expect(Array.from(nd.data)).toEqual([1, -2, 2147483647, -2147483648]);
    expect(nd.shape).toEqual([2, 2]);
  });

  it("ndArraySerializer round-trips {data, shape} and null", () => {
    const nd = { data: new Float32Array([1, 2, 3, 4, 5, 6]), shape: [2, 3] };
    const back = ndArraySerializer.deserialize(ndArraySerializer.serialize(nd));
    expect(back).toEqual(nd);
    expect(ndArraySerializer.serialize(null)).toBeNull();
    expect(typedArraySerializer.deserialize(null)).toBeNull();
  });

  it("toWireArray / fromWireArray reject bad shapes, dtypes and sizes with the reason", () => {
    expect(() => toWireArray({ data: new Float64Array(3), shape: [2, 2] })).toThrow(/does not match its 3 elements/);
    expect(() => fromWireArray({ dtype: "complex128", shape: [1], buffer: new DataView(new ArrayBuffer(16)) })).toThrow(/unknown dtype "complex128"/);
    expect(() => fromWireArray({ dtype: "float64", shape: [1], buffer: new DataView(new ArrayBuffer(7)) })).toThrow(/not a whole number of float64/);
    expect(() => fromWireArray({ dtype: "float64", shape: [1] })).toThrow(/binary frame/);
  });
});

describe("removeBuffers / putBuffers", () => {
  it("removeBuffers(state) takes binary leaves out without touching the input", () => {
    const x = new Float64Array([1, 2]);
    const state = { a: 1, x: { dtype: "float64", shape: [2], buffer: new DataView(x.buffer) }, list: [new Uint8Array([5]), "s"] };
    const split = removeBuffers(state);
    expect(split.state).toEqual({ a: 1, x: { dtype: "float64", shape: [2] }, list: [null, "s"] });
    expect(split.bufferPaths).toEqual([["x", "buffer"], ["list", 0]]);
    expect(split.buffers.length).toBe(2);
    expect(state.x.buffer).toBeInstanceOf(DataView);
  });

  it("putBuffers(state, paths, buffers) restores them as DataViews", () => {
    const state: Record<string, unknown> = { x: { dtype: "uint8", shape: [1] }, list: [null] };
    const views = [new DataView(new Uint8Array([3]).buffer), new DataView(new Uint8Array([4]).buffer)];
    putBuffers(state, [["x", "buffer"], ["list", 0]], views);
    expect((state.x as { buffer: DataView }).buffer.getUint8(0)).toBe(3);
    expect(((state.list as DataView[])[0]).getUint8(0)).toBe(4);
  });

  it("putBuffers rejects paths that do not lead into the state and too few buffers", () => {
    expect(() => putBuffers({}, [["missing", "buffer"]], [new DataView(new ArrayBuffer(1))])).toThrow(/does not lead into the state/);
    expect(() => putBuffers({}, [["a"]], [])).toThrow(/lists 1 buffers but the message carries 0/);
  });
});
