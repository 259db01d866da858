import { describe, expect, it } from "vitest";
import { DataError, InvalidArgumentError } from "../src/errors.js";

describe("errors", () => {
  it("InvalidArgumentError(argument, value, allowed) names all three", () => {
    const error = new InvalidArgumentError("wavelength", -1, "a positive length in m");
    expect(error.message).toBe("invalid wavelength: -1 (a positive length in m)");
    expect(error.code).toBe("invalid-argument");
  });
  it("DataError(source, problem, hint, line) gives file:line, problem and what to do", () => {
    const error = new DataError("scan.csv", "cell 'abc' is not a number", "fix or remove the row", 12);
    expect(error.message).toBe("scan.csv:12: cell 'abc' is not a number; fix or remove the row");
    expect(error.line).toBe(12);
  });
});
