/**
 * Checking `buffer_paths` of widget messages and embedded widget state before anything walks
 * them (kernel: putBuffers; page: the widget manager's put_buffers). A path is a list of object
 * keys and array indices; `__proto__`, `constructor` and `prototype` would reach
 * Object.prototype (prototype pollution), so they are refused, as is anything but a string or a
 * non-negative integer. Pure: no DOM, used by the kernel and the page.
 */

/** Path elements that lead out of plain data into prototypes. */
const FORBIDDEN = new Set(["__proto__", "constructor", "prototype"]);

/**
 * Throws TypeError naming the first bad path or element: not a non-empty list, an element that
 * is neither a string nor a non-negative integer, or `__proto__` / `constructor` / `prototype`.
 * @param paths the message's `buffer_paths` (untrusted)
 */
export function checkBufferPaths(paths: unknown): asserts paths is (string | number)[][] {
  if (!Array.isArray(paths)) throw new TypeError(`buffer_paths is not a list: ${typeof paths}`);
  paths.forEach((path, i) => {
    if (!Array.isArray(path) || path.length === 0) throw new TypeError(`buffer_paths[${i}] is not a non-empty list`);
    for (const element of path) {
      const ok = typeof element === "string" ? !FORBIDDEN.has(element) : Number.isSafeInteger(element) && (element as number) >= 0;
      if (!ok) {
        throw new TypeError(`buffer_paths[${i}] has a forbidden element ${JSON.stringify(String(element)).slice(0, 40)} (only data keys and array indices; never __proto__, constructor or prototype)`);
      }
    }
  });
}
