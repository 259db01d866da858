// parseFrames(key, frames, history): a captured signed message cannot be replayed. Jupyter's
// reference kernel (ipykernel, through jupyter_client's Session) keeps a bounded history of the
// signatures it has seen and refuses a duplicate (from memory: Session.digest_history,
// digest_history_size 2^16); the messaging spec 5.3 signs every message with a fresh msg_id.
import { describe, expect, it } from "vitest";
import { encodeFrames, makeHeader, parseFrames, SignatureHistory, WireError } from "../../kernel-ext/server/wire.js";

const KEY = "5d0a3c0e-2f4b-4d7e-8c61-0a9b8e7f6d5c";
const frames = () => encodeFrames(KEY, { identities: [], header: makeHeader("execute_request", "s"), parent: {}, metadata: {}, content: { code: "1" }, buffers: [] });

describe("parseFrames(key, frames, history)", () => {
  it("parseFrames(the same signed message twice) refuses the replay", () => {
    const history = new SignatureHistory(16);
    const message = frames();
    expect(parseFrames(KEY, message, history).content).toEqual({ code: "1" });
    expect(() => parseFrames(KEY, message, history)).toThrow(WireError);
    expect(() => parseFrames(KEY, message, history)).toThrow(/replayed message/);
  });

  it("parseFrames(a forged signature) does not enter the history (the genuine message still passes)", () => {
    const history = new SignatureHistory(16);
    const message = frames();
    const at = message.findIndex((f) => f.toString() === "<IDS|MSG>");
    const forged = message.slice();
    forged[at + 2] = Buffer.from(JSON.stringify({ ...JSON.parse(message[at + 2]!.toString()), msg_type: "shutdown_request" }));
    expect(() => parseFrames(KEY, forged, history)).toThrow(/wrong HMAC/);
    expect(() => parseFrames(KEY, message, history)).not.toThrow();
  });

  it("SignatureHistory(capacity) stays bounded and forgets the oldest", () => {
    const history = new SignatureHistory(4);
    for (let i = 0; i < 10; i++) expect(history.add(`sig-${i}`)).toBe(true);
    expect(history.size).toBe(4);
    expect(history.add("sig-9")).toBe(false); // still remembered
    expect(history.add("sig-0")).toBe(true); // forgotten long ago
  });

  it("the kernel passes its history to parseFrames (one history per kernel)", async () => {
    const source = await import("node:fs").then((fs) => fs.readFileSync(new URL("../../kernel-ext/server/kernel.ts", import.meta.url), "utf8"));
    expect(source).toMatch(/parseFrames\(server\.connInfo\.key, frames, this\.signatures\)/);
  });
});
