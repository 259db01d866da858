// putBuffers / the page's embedded-state filter with hostile buffer_paths: "__proto__",
// "constructor" and "prototype" path elements are refused, so a signed comm_msg or an embedded
// widget state cannot write into Object.prototype (prototype pollution: common practice, see
// the ECMAScript spec's [[Prototype]] and Object.prototype.__proto__ accessor).
import { afterEach, describe, expect, it } from "vitest";
import { putBuffers } from "../../kernel-ext/widget/buffers.js";
import { checkBufferPaths } from "../../widgets/shared/bufferPaths.js";

const view = () => new DataView(new ArrayBuffer(4));
afterEach(() => {
  delete (Object.prototype as Record<string, unknown>)["polluted"];
  if (Object.prototype.toString !== Object.prototype.constructor.prototype.toString) throw new Error("toString replaced");
});

describe("putBuffers(state, hostile paths, buffers)", () => {
  const hostile: (string | number)[][] = [["__proto__", "polluted"], ["constructor", "prototype", "polluted"], ["x", "__proto__", "polluted"], ["prototype"], ["toString", "polluted"]];
  for (const path of hostile) {
    it(`putBuffers({x: {}}, [${JSON.stringify(path)}]) throws and leaves Object.prototype alone`, () => {
      const saved = Object.prototype.toString;
      expect(() => putBuffers({ x: {} }, [path], [view()])).toThrow(/buffer_paths\[0\]/);
      expect(({} as Record<string, unknown>)["polluted"]).toBeUndefined();
      expect(Object.prototype.toString).toBe(saved);
      expect(String({})).toBe("[object Object]");
    });
  }

  it("putBuffers(state, [[\"__proto__\", \"toString\"]]) cannot break String({})", () => {
    expect(() => putBuffers({}, [["__proto__", "toString"]], [view()])).toThrow(/__proto__/);
    expect(String({})).toBe("[object Object]");
  });

  it("putBuffers(state, non-string non-index element) throws", () => {
    expect(() => putBuffers({ a: [] }, [["a", -1]], [view()])).toThrow(/buffer_paths\[0\]/);
    expect(() => putBuffers({ a: {} }, [["a", { toString: () => "x" } as unknown as string]], [view()])).toThrow(/buffer_paths\[0\]/);
  });

  it("putBuffers(state, ordinary paths) still works", () => {
    const state: Record<string, any> = { x: { dtype: "float64" }, list: [null] };
    putBuffers(state, [["x", "buffer"], ["list", 0]], [view(), view()]);
    expect(state.x.buffer).toBeInstanceOf(DataView);
    expect(state.list[0]).toBeInstanceOf(DataView);
  });
});

describe("checkBufferPaths(paths) (the page's check, before the widget manager's put_buffers)", () => {
  it("checkBufferPaths([[\"__proto__\", \"polluted\"]]) names the element", () => {
    expect(() => checkBufferPaths([["__proto__", "polluted"]])).toThrow(/buffer_paths\[0\].*"__proto__"/);
    expect(() => checkBufferPaths([["a", "constructor"]])).toThrow(/constructor/);
    expect(() => checkBufferPaths("not a list" as unknown as string[][])).toThrow(/buffer_paths/);
    expect(() => checkBufferPaths([["x", "buffer"], ["list", 0]])).not.toThrow();
  });
});
