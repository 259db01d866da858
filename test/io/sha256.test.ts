import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { sha256Hex, utf8Encode } from "../../src/advanced.js";

const ascii = (text: string): Uint8Array => Uint8Array.from(text, (c) => c.charCodeAt(0));

describe("sha256Hex(bytes)", () => {
  // FIPS 180-2, Appendix B.1 and B.2 (one-block and two-block messages); empty message from NIST CAVP SHA256ShortMsg (Len = 0).
  it("sha256Hex matches the FIPS 180-2 examples", () => {
    expect(sha256Hex(ascii("abc"))).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(sha256Hex(ascii("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"))).toBe("248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    expect(sha256Hex(new Uint8Array(0))).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  });

  it("sha256Hex agrees with Python's hashlib at every length around the block boundaries", () => {
    const lengths = [1, 55, 56, 63, 64, 65, 119, 120, 127, 128, 1000, 100_003];
    const inputs = lengths.map((n) => Uint8Array.from({ length: n }, (_, i) => (i * 131 + n) & 255));
    const script = "import hashlib,sys\nfor n in map(int, sys.argv[1:]):\n    print(hashlib.sha256(bytes((i*131+n)&255 for i in range(n))).hexdigest())";
    const run = spawnSync("/usr/bin/python3", ["-c", script, ...lengths.map(String)], { encoding: "utf8" });
    if (run.error) {
      console.warn("SKIPPED: /usr/bin/python3 not available for the hashlib comparison");
      return;
    }
    expect(run.stdout.trim().split("\n")).toEqual(inputs.map(sha256Hex));
  });

  it("utf8Encode(text) encodes like Python's str.encode('utf-8')", () => {
    // Reference bytes: Python 3, "5.5 µm → λ 😀".encode("utf-8").hex()
    const bytes = utf8Encode("5.5 µm → λ 😀");
    expect(Buffer.from(bytes).toString("hex")).toBe("352e3520c2b56d20e2869220cebb20f09f9880");
  });
});
