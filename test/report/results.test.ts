import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DataError } from "../../src/errors.js";
import type { FitResult } from "../../src/fit/types.js";
import { getModel } from "../../src/physics/registry.js";
import type { Profile } from "../../src/profile.js";
import { decodeFloat64, encodeArray, encodeJson } from "../../src/report/results/arrays.js";
import { decodeBase64, encodeBase64 } from "../../src/report/results/base64.js";
import { replayResults, type ReplayEngine } from "../../src/api/replay.js";
import {
  comparisonDocument, fitDocument, parseResults, RESULTS_FORMAT_VERSION, scanDocument, stringifyResults,
} from "../../src/report/results/resultsDocument.js";
import { FRINGEKIT_VERSION } from "../../src/report/version.js";
import { coherenceExample, comparisonExample, fitExample } from "./figureExamples.js";

const SHA = "a".repeat(64);
const OTHER_SHA = "b".repeat(64);

function fileProfile(): { profile: Profile; result: FitResult } {
  const { profile, result } = fitExample();
  profile.provenance = { source: "scan <1>.csv", sha256: SHA, options: { xColumn: "position [mm]", pitch: 11e-6 }, notes: ["24 pixels masked"] };
  return { profile, result };
}

describe("encodeBase64 / decodeBase64", () => {
  it("encodeBase64 matches the RFC 4648 §10 test vectors", () => {
    const vectors: [string, string][] = [["", ""], ["f", "Zg=="], ["fo", "Zm8="], ["foo", "Zm9v"], ["foob", "Zm9vYg=="], ["fooba", "Zm9vYmE="], ["foobar", "Zm9vYmFy"]];
    for (const [plain, coded] of vectors) {
      expect(encodeBase64(new TextEncoder().encode(plain))).toBe(coded);
      expect(new TextDecoder().decode(decodeBase64(coded))).toBe(plain);
    }
  });
  it("decodeBase64 refuses bad characters and lengths, naming the field", () => {
    expect(() => decodeBase64("Zm9v!A==", "fits[0].model")).toThrow(/invalid fits\[0\]\.model: "character \\"!\\" at 4"/);
    expect(() => decodeBase64("Zm9", "x")).toThrow(/multiple of 4/);
  });
});

describe("encodeArray / decodeFloat64", () => {
  it("keeps every bit: NaN, ±Infinity, −0, subnormals, extremes (IEEE 754 binary64)", () => {
    const values = Float64Array.from([NaN, Infinity, -Infinity, -0, 0, 5e-324, 2.2250738585072014e-308, Number.MAX_VALUE, 0.1 + 0.2, -1 / 3]);
    const back = decodeFloat64(JSON.parse(JSON.stringify(encodeArray(values))), "v");
    expect(new Uint8Array(back.buffer)).toEqual(new Uint8Array(values.buffer));
  });
});

describe("fitDocument(profile, fit) → stringifyResults → parseResults", () => {
  it("parseResults(text) reads files written before the rename: parameter \"stderr\" becomes \"uncertainty\"", () => {
    const { profile, result } = fileProfile();
    // Written as version 1 did: parameters as a list (encodeJson of the document), `stderr`.
    const old = encodeJson({ ...fitDocument(profile, { result }), formatVersion: 1 }) as { fits: { result: { parameters: Record<string, unknown>[] } }[] };
    for (const p of old.fits[0].result.parameters) { p.stderr = p.uncertainty; delete p.uncertainty; }
    const back = parseResults(JSON.stringify(old));
    expect(back.fits[0].result.parameters.map((p) => p.uncertainty)).toEqual(result.parameters.map((p) => p.uncertainty));
    expect(back.fits[0].result.parameters.some((p) => "stderr" in p)).toBe(false);
  });
  it("round-trips the FitResult exactly (Float64Arrays bit for bit, Infinity uncertainty, NaN residuals)", () => {
    const { profile, result } = fileProfile();
    result.parameters[0].uncertainty = Infinity; // an unestimable uncertainty must survive
    result.warnings.push({ code: "ill-conditioned", message: "cond 1e12 \"quoted\" <b>", parameter: "center" });
    const doc = fitDocument(profile, { result, modelOptions: { pixelNodes: 5 }, fitOptions: { noise: "poisson", bounds: { visibility: [0, 1] }, maxEvaluations: 500, onProgress: () => 0 } }, { seeds: { bootstrap: 42 } });
    const back = parseResults(stringifyResults(doc));
    expect(back.fits[0].result).toEqual(result);
    expect(back.fits[0].result.model).toBeInstanceOf(Float64Array);
    expect(new Uint8Array(back.fits[0].result.residuals.buffer)).toEqual(new Uint8Array(result.residuals.buffer));
    expect(back.fits[0].result.parameters[0].uncertainty).toBe(Infinity);
    expect(back.fits[0].fitOptions).toEqual({ noise: "poisson", bounds: { visibility: [0, 1] }, maxEvaluations: 500 });
    expect(back.fits[0].modelOptions).toEqual({ pixelNodes: 5 });
    expect(back.seeds).toEqual({ bootstrap: 42 });
  });
  it("records version, model id, noise model, input name, SHA-256, read options and mask", () => {
    const { profile, result } = fileProfile();
    const doc = parseResults(stringifyResults(fitDocument(profile, { result })));
    expect(doc).toMatchObject({ format: "fringekit-results", formatVersion: RESULTS_FORMAT_VERSION, kind: "fit", fringekitVersion: FRINGEKIT_VERSION });
    expect(doc.input).toMatchObject({ source: "scan <1>.csv", sha256: SHA, readOptions: { pitch: 11e-6 }, points: 1024, data: null });
    expect(doc.input.mask).toEqual(profile.mask);
    expect(doc.fits[0]).toMatchObject({ modelId: "two-slit", label: "two-slit" });
    expect(doc.fits[0].result.noise).toBe(result.noise);
  });
  it("embeds the data of a profile that never was a file, and reads it back", () => {
    const { profile, result } = fitExample();
    const doc = parseResults(stringifyResults(fitDocument(profile, { result })));
    expect(doc.input.sha256).toBeNull();
    expect(doc.input.data!.x).toEqual(profile.x);
    expect(doc.input.data!.sigma).toEqual(profile.sigma);
  });
  it("writes identical text for identical input (no time stamp unless asked)", () => {
    const { profile, result } = fileProfile();
    expect(stringifyResults(fitDocument(profile, { result }))).toBe(stringifyResults(fitDocument(profile, { result })));
  });
  it("FRINGEKIT_VERSION equals package.json's version", () => {
    const pkg = JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8"));
    expect(FRINGEKIT_VERSION).toBe(pkg.version);
  });
});

describe("comparisonDocument / scanDocument", () => {
  it("comparisonDocument round-trips every fit with its label and the verdict", () => {
    const { profile, fits } = comparisonExample();
    const doc = parseResults(stringifyResults(comparisonDocument(profile, fits, { verdict: "far field, V free preferred (ΔAIC = 812)" })));
    expect(doc.kind).toBe("comparison");
    expect(doc.fits.map((f) => f.label)).toEqual(fits.map((f) => f.label));
    expect(doc.fits[1].result).toEqual(fits[1].result);
    expect(doc.verdict).toMatch(/preferred/);
  });
  it("scanDocument round-trips a coherence-scan fit with derived quantities", () => {
    const { scan, result } = coherenceExample();
    const doc = parseResults(stringifyResults(scanDocument(scan, { result }, { derived: { diameter: { value: 4e-4, stderr: 1e-5, unit: "m" } } })));
    expect(doc.kind).toBe("scan");
    expect(doc.fits[0].result).toEqual(result);
    expect(doc.derived).toEqual({ diameter: { value: 4e-4, stderr: 1e-5, unit: "m" } });
  });
  it("comparisonDocument refuses a single fit; fitDocument refuses a result of other data", () => {
    const { profile, fits } = comparisonExample();
    expect(() => comparisonDocument(profile, fits.slice(0, 1))).toThrow(/two or more fits/);
    const { scan } = coherenceExample();
    expect(() => fitDocument(scan, { result: fits[0].result })).toThrow(/results of this profile \(9 points\)/);
  });
});

describe("parseResults(text, source) refuses what it cannot read", () => {
  const { profile, result } = fileProfile();
  const good = JSON.parse(stringifyResults(fitDocument(profile, { result })));
  it("refuses non-JSON, foreign JSON and newer versions with file name and hint", () => {
    expect(() => parseResults("{oops", "r.json")).toThrow(/^r\.json: not JSON .*; give the \.json file written by fringekit$/);
    expect(() => parseResults('{"a":1}', "r.json")).toThrow(/not a fringekit results file/);
    expect(() => parseResults(JSON.stringify({ ...good, formatVersion: 99 }), "r.json")).toThrow(/version 99 is not readable .*; update fringekit/);
  });
  it("refuses damaged fields by name, as DataError", () => {
    const damaged = structuredClone(good);
    damaged.fits[0].result.model.base64 = damaged.fits[0].result.model.base64.slice(8);
    expect(() => parseResults(JSON.stringify(damaged), "r.json")).toThrow(DataError);
    const short = structuredClone(good);
    short.input.points = 10;
    expect(() => parseResults(JSON.stringify(short), "r.json")).toThrow(/field input\.mask is missing or malformed/);
    const badHash = structuredClone(good);
    badHash.input.sha256 = "xyz";
    expect(() => parseResults(JSON.stringify(badHash), "r.json")).toThrow(/input\.sha256/);
  });
});

describe("replayResults(doc, profile, engine)", () => {
  const model = getModel("two-slit");
  /** An engine whose fitter returns a given result (stands in for fitProfile; the real one is tested in replay-fit tests). */
  const engine = (answer: (r: FitResult) => FitResult, seen: { profile?: Profile; options?: unknown } = {}): ReplayEngine => ({
    getModel: () => model,
    fitProfile: (p, _m, o) => {
      seen.profile = p;
      seen.options = o;
      return answer(structuredClone(fitExample().result));
    },
  });

  it("reports reproduced when every number comes back the same", () => {
    const { profile, result } = fileProfile();
    const doc = parseResults(stringifyResults(fitDocument(profile, { result, fitOptions: { noise: "gaussian" } })));
    const seen: { profile?: Profile; options?: unknown } = {};
    const report = replayResults(doc, { ...profile, mask: undefined }, engine((r) => r, seen));
    expect(report.reproduced).toBe(true);
    expect(report.summary).toMatch(/^Reproduced: 1 fit \(two-slit\) on data scan <1>\.csv matched by SHA-256/);
    expect(seen.profile!.mask).toEqual(profile.mask); // the recorded mask is applied
    expect(seen.options).toEqual({ noise: "gaussian" });
  });
  it("lists what differs beyond tolerance (value by > 1e-3 σ, χ², warnings)", () => {
    const { profile, result } = fileProfile();
    const doc = parseResults(stringifyResults(fitDocument(profile, { result })));
    const report = replayResults(doc, profile, engine((r) => {
      const sep = r.parameters.find((p) => p.name === "separation")!;
      sep.value += 0.01 * sep.uncertainty;
      r.statistics.chi2 *= 1.001;
      r.warnings.push({ code: "at-bound", message: "", parameter: "visibility" });
      return r;
    }));
    expect(report.reproduced).toBe(false);
    expect(report.differences.map((d) => d.quantity)).toEqual(["separation value", "chi2", "warnings"]);
    expect(report.summary).toMatch(/^NOT reproduced: 3 differences/);
  });
  it("accepts a value change below 1e-3 standard errors", () => {
    const { profile, result } = fileProfile();
    const doc = parseResults(stringifyResults(fitDocument(profile, { result })));
    const report = replayResults(doc, profile, engine((r) => {
      const sep = r.parameters.find((p) => p.name === "separation")!;
      sep.value += 1e-4 * sep.uncertainty;
      return r;
    }));
    expect(report.reproduced).toBe(true);
  });
  it("refuses data whose SHA-256 differs, clearly and before fitting", () => {
    const { profile, result } = fileProfile();
    const doc = parseResults(stringifyResults(fitDocument(profile, { result })));
    let fitted = false;
    const other = { ...profile, provenance: { ...profile.provenance!, source: "other.csv", sha256: OTHER_SHA } };
    expect(() => replayResults(doc, other, { getModel: () => model, fitProfile: () => { fitted = true; return result; } })).toThrow(
      /^other\.csv: SHA-256 bbbbbbbbbbbbbbbb… does not match aaaaaaaaaaaaaaaa… recorded for scan <1>\.csv; this is not the data the result was made from/,
    );
    expect(fitted).toBe(false);
  });
  it("replays from embedded data without a file, and asks for the file when nothing is embedded", () => {
    const { profile, result } = fitExample();
    const embedded = parseResults(stringifyResults(fitDocument(profile, { result })));
    expect(replayResults(embedded, null, engine((r) => r)).dataCheck).toBe("embedded");
    const withFile = fileProfile();
    const doc = parseResults(stringifyResults(fitDocument(withFile.profile, { result: withFile.result })));
    expect(() => replayResults(doc, null, engine((r) => r))).toThrow(/does not embed its data; give the data file it was made from \(--data scan <1>\.csv\)/);
  });
});

describe("parseResults with hostile keys", () => {
  it("drops __proto__ keys instead of changing an object's prototype", () => {
    const { profile, result } = fileProfile();
    const text = stringifyResults(fitDocument(profile, { result, fitOptions: { noise: "poisson" } }));
    const hostile = text.replace('"noise": "poisson"', '"noise": "poisson", "__proto__": { "polluted": true }');
    expect(hostile.indexOf("__proto__")).toBeLessThan(hostile.indexOf('"result"')); // inside fitOptions
    const doc = parseResults(hostile);
    expect((doc.fits[0].fitOptions as { polluted?: boolean }).polluted).toBeUndefined();
    expect(Object.getPrototypeOf(doc.fits[0].fitOptions)).toBe(Object.prototype);
    expect(({} as { polluted?: boolean }).polluted).toBeUndefined();
  });
});
