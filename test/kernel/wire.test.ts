// Wire format (Jupyter messaging spec 5.3, "The Wire Protocol"): signatures are compared with
// Python's hmac module, which jupyter_client itself uses.
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { encodeFrames, makeHeader, parseFrames, sign, WireError } from "../../kernel-ext/server/wire.js";
import { python } from "./helpers.js";

const KEY = "0f4c9d1e-5a5e-4c8e-9a51-1b7d2f0a9e33";
const noPython = spawnSync(python, ["-c", "pass"]).status !== 0;

function message() {
  return {
    identities: [Buffer.from("client-1")],
    header: makeHeader("comm_msg", "session-a"),
    parent: {},
    metadata: { m: 1 },
    content: { comm_id: "c1", data: { x: [1, 2] } },
    buffers: [Buffer.from([0, 1, 2, 255]), Buffer.alloc(1024, 7)],
  };
}

describe("encodeFrames / parseFrames", () => {
  it("parseFrames(key, encodeFrames(key, msg)) returns the message with raw buffers", () => {
    const msg = message();
    const parsed = parseFrames(KEY, encodeFrames(KEY, msg));
    expect(parsed.header).toEqual(msg.header);
    expect(parsed.content).toEqual(msg.content);
    expect(parsed.metadata).toEqual(msg.metadata);
    expect(parsed.identities.map(String)).toEqual(["client-1"]);
    expect(parsed.buffers).toEqual(msg.buffers);
  });

  it.skipIf(noPython)("encodeFrames signs the four JSON frames exactly as Python's hmac does", () => {
    const frames = encodeFrames(KEY, message());
    const at = frames.findIndex((f) => f.toString() === "<IDS|MSG>");
    const json = frames.slice(at + 2, at + 6).map((f) => f.toString("base64"));
    const script = "import hmac, hashlib, base64, sys, json\nparts=[base64.b64decode(p) for p in json.loads(sys.argv[2])]\nprint(hmac.new(sys.argv[1].encode(), b''.join(parts), hashlib.sha256).hexdigest())";
    const run = spawnSync(python, ["-c", script, KEY, JSON.stringify(json)], { encoding: "utf8" });
    expect(run.status, run.stderr).toBe(0);
    expect(frames[at + 1].toString()).toBe(run.stdout.trim());
  });

  it("parseFrames rejects a wrong signature, a missing delimiter, short and non-JSON frames", () => {
    const frames = encodeFrames(KEY, message());
    expect(() => parseFrames("other-key", frames)).toThrow(WireError);
    expect(() => parseFrames(KEY, frames.filter((f) => f.toString() !== "<IDS|MSG>"))).toThrow(/delimiter/);
    expect(() => parseFrames(KEY, [Buffer.from("<IDS|MSG>"), Buffer.from("x")])).toThrow(/frames after the delimiter/);
    const bad = [Buffer.from("<IDS|MSG>"), Buffer.alloc(0), Buffer.from("{oops"), Buffer.from("{}"), Buffer.from("{}"), Buffer.from("{}")];
    bad[1] = Buffer.from(sign(KEY, bad.slice(2, 6)));
    expect(() => parseFrames(KEY, bad)).toThrow(/header frame is not JSON/);
  });

  it("sign(\"\", parts) is empty: an empty key turns signing off (spec 5.3)", () => {
    expect(sign("", [Buffer.from("{}")])).toBe("");
    const frames = encodeFrames("", message());
    expect(parseFrames("", frames).content).toEqual(message().content);
  });
});
