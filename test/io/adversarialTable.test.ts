// parseTable(adversarial text) in bounded time: long header cells (a regular expression with
// nested lazy groups takes quadratic time on "position ((((…") and long number cells ("1111…x")
// are refused or parsed in linear time, with a clear one-line message. Quadratic cost of
// backtracking regular expressions on such inputs: common practice (ReDoS).
import { describe, expect, it } from "vitest";
import { DataError, parseTable } from "../../src/advanced.js";

const N = 60_000;
/** Runs `fn`, returns the error it throws and the time it took (ms). */
function timed(fn: () => unknown): { error: unknown; ms: number } {
  const start = performance.now();
  let error: unknown;
  try { fn(); } catch (caught) { error = caught; }
  return { error, ms: performance.now() - start };
}
const rows = Array.from({ length: 20 }, (_, i) => `${i},${100 + i}`).join("\n");
// Generous for a loaded machine; the quadratic versions take tens of seconds at this size.
const MAX_MS = 3000;

describe("parseTable(adversarial cells)", () => {
  it(`parseTable("position ((((… (${N} chars),intensity") refuses the header cell quickly`, () => {
    const { error, ms } = timed(() => parseTable(`position ${"(".repeat(N)},intensity\n${rows}\n`, { source: "h.csv" }));
    expect(error).toBeInstanceOf(DataError);
    expect((error as Error).message).toMatch(/^h\.csv:1: a header cell of \d+ characters, above the limit of 200; /);
    expect(ms).toBeLessThan(MAX_MS);
  });

  it(`parseTable("# position ((((…" comment header) refuses the header cell quickly`, () => {
    const { error, ms } = timed(() => parseTable(`# position ${"(".repeat(N)},intensity\n${rows}\n`, { source: "c.csv" }));
    expect(ms).toBeLessThan(MAX_MS);
    expect(error === undefined || error instanceof DataError).toBe(true);
  });

  it(`parseTable(a ${N}-digit number followed by "x") says non-numeric quickly`, () => {
    const { error, ms } = timed(() => parseTable(`position (mm),intensity\n${rows}\n21,${"1".repeat(N)}x\n`, { source: "n.csv" }));
    expect((error as Error).message).toMatch(/^n\.csv:22: a non-numeric cell "1{21}\.\.\." in column "intensity"/);
    expect(ms).toBeLessThan(MAX_MS);
  });

  it(`parseTable(a ${N}-digit number with a decimal comma and junk) stays linear`, () => {
    const { error, ms } = timed(() => parseTable(`position (mm);intensity\n${rows.replaceAll(",", ";")}\n21;${"1".repeat(N)},${"2".repeat(N)}e+x\n`, { source: "d.csv" }));
    expect(error).toBeInstanceOf(DataError);
    expect(ms).toBeLessThan(MAX_MS);
  });

  it("parseTable(ordinary long numbers) still parses them", () => {
    const { profile } = parseTable(`position (mm),intensity\n${rows}\n21,${"1".repeat(300)}.5e-290\n`, { source: "ok.csv" });
    expect(profile.y[20]).toBeCloseTo(Number(`${"1".repeat(300)}.5e-290`), 0);
  });
});
