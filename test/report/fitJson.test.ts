// fitJson(result) → the one JSON shape of a fit (command line, widgets, results documents), and
// readFitJson / parseResults reading the shapes written before it.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { encodeJson } from "../../src/report/results/arrays.js";
import { fitJson, readFitJson } from "../../src/report/results/fitJson.js";
import { fitDocument, parseResults, RESULTS_FORMAT_VERSION, stringifyResults } from "../../src/report/results/resultsDocument.js";
import { fitExample } from "./figureExamples.js";
import { makeFitResult } from "./fixtures.js";

const PYTHON = "/usr/bin/python3";

describe("fitJson(result)", () => {
  const result = makeFitResult();
  result.parameters[2]!.uncertainty = Infinity; // amplitude: could not be estimated

  it("fitJson(result) keys parameters by name in model order, as fit.params does (SI values)", () => {
    const json = fitJson(result);
    expect(Object.keys(json)).toEqual(["modelId", "noise", "converged", "reason", "message", "iterations", "params", "statistics", "warnings", "goodness"]);
    expect(Object.keys(json.params)).toEqual(result.parameters.map((p) => p.name));
    expect(json.params.separation).toEqual({ value: 5.00123e-4, uncertainty: 3.41e-7, unit: "m", fixed: false, atBound: null });
    expect(json.params.wavelength).toMatchObject({ value: 632.8e-9, uncertainty: 0, fixed: true });
    expect(json.statistics.n).toBe(64);
  });

  it("fitJson(result) is strict JSON (RFC 8259 §6: no NaN or Infinity literals): Python's json reads it with such literals refused", () => {
    const text = JSON.stringify(fitJson(result, "full"));
    expect(JSON.parse(text)).toEqual(fitJson(result, "full")); // JSON-safe as it stands: nothing turned into null on the way
    if (!existsSync(PYTHON)) return console.warn(`SKIPPED: Python check (${PYTHON} missing)`);
    const script = "import json,sys\ndef refuse(c): raise ValueError(c)\nd=json.loads(sys.stdin.read(), parse_constant=refuse)\nprint(json.dumps([d['params']['separation']['value'], d['params']['amplitude']['uncertainty'], d['params']['visibility']['upper']]))";
    const run = spawnSync(PYTHON, ["-c", script], { input: text, encoding: "utf8" });
    expect(run.stderr).toBe("");
    expect(JSON.parse(run.stdout)).toEqual([5.00123e-4, { nonFinite: "Infinity" }, 1]);
  });

  it("readFitJson(JSON.parse(JSON.stringify(fitJson(result)))) gives the numbers back, Infinity included", () => {
    const back = readFitJson(JSON.parse(JSON.stringify(fitJson(result))));
    expect(back.params.amplitude!.uncertainty).toBe(Infinity);
    expect(back.params.separation!.value).toBe(5.00123e-4);
    expect(back.statistics).toEqual(result.statistics);
  });

  it("readFitJson reads the widgets' summary written before the one shape (parameters as a list, null = not estimable)", () => {
    // As widgets/shared/fitSummary wrote it into notebooks' widget state.
    const old = {
      modelId: "two-slit", noise: "poisson", converged: true, reason: "converged-step", message: "ok", iterations: 9,
      parameters: [
        { name: "separation", unit: "m", value: 5e-4, uncertainty: 3e-7, fixed: false, atBound: null },
        { name: "amplitude", unit: "counts", value: 2e4, uncertainty: null, fixed: false, atBound: "lower" },
      ],
      statistics: { n: 64, nFree: 7, dof: 57, chi2: 58.3, reducedChi2: 1.02, aic: 616.5, bic: 631.6 },
      warnings: [],
    };
    const back = readFitJson(JSON.parse(JSON.stringify(old)), "widget state");
    expect(Object.keys(back.params)).toEqual(["separation", "amplitude"]);
    expect(back.params.separation).toEqual({ value: 5e-4, uncertainty: 3e-7, unit: "m", fixed: false, atBound: null });
    expect(back.params.amplitude!.uncertainty).toBe(Infinity);
    expect(back.params.amplitude!.atBound).toBe("lower");
    expect(back.goodness).toBeNull();
  });

  it("readFitJson reads `fringekit fit --json` written before the one shape (model, stats, null uncertainty)", () => {
    const old = {
      model: "two-slit", converged: true, reason: "converged-step",
      params: { separation: { value: 5e-4, uncertainty: null, unit: "m", fixed: false }, wavelength: { value: 6.328e-7, uncertainty: 0, unit: "m", fixed: true } },
      stats: { n: 2048, dof: 2041, chi2: 2050, reducedChi2: null, logLikelihood: -9000, aic: 18014, aicc: 18014.1, bic: 18053 },
      warnings: [{ code: "data", message: "3 rows skipped" }], goodness: null, provenance: null,
    };
    const back = readFitJson(old, "part file");
    expect(back.modelId).toBe("two-slit");
    expect(back.statistics.n).toBe(2048);
    expect(back.statistics.reducedChi2).toBeNaN();
    expect(back.params.separation!.uncertainty).toBe(Infinity);
    expect(back.params.wavelength!.uncertainty).toBe(0);
    expect(() => readFitJson({ hello: 1 }, "x.json")).toThrow(/x\.json: not the JSON of a fit \(no modelId or params\)/);
  });
});

describe("results documents hold each fit in the one shape", () => {
  const { profile, result } = fitExample();
  result.parameters[0]!.uncertainty = Infinity;

  it(`stringifyResults writes format version ${RESULTS_FORMAT_VERSION} with fits[i].result = fitJson(result, "full")`, () => {
    const raw = JSON.parse(stringifyResults(fitDocument(profile, { result })));
    expect(raw.formatVersion).toBe(2);
    expect(raw.fits[0].result).toEqual(JSON.parse(JSON.stringify(fitJson(result, "full"))));
    // The summary the command line and the widgets carry is a part of it.
    expect(raw.fits[0].result).toMatchObject(JSON.parse(JSON.stringify(fitJson(result))));
    expect(raw.fits[0].result.parameters).toBeUndefined();
  });

  it("parseResults reads a version-1 file (parameters as a list) into the same document as version 2", () => {
    const doc = fitDocument(profile, { result });
    // Version 1 was encodeJson(document) with the FitResult as it is (parameters as a list).
    const v1 = `${JSON.stringify(encodeJson({ ...doc, formatVersion: 1 }), null, 2)}\n`;
    expect(JSON.parse(v1).fits[0].result.parameters).toHaveLength(result.parameters.length);
    const fromV1 = parseResults(v1, "old.json");
    const fromV2 = parseResults(stringifyResults(doc), "new.json");
    expect(fromV1.fits[0]!.result).toEqual(fromV2.fits[0]!.result);
    expect(fromV2.fits[0]!.result.parameters).toEqual(result.parameters);
    expect(fromV2.fits[0]!.result.parameters[0]!.uncertainty).toBe(Infinity);
  });
});
