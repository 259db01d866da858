/**
 * Error classes of fringekit. Every error says what is wrong, where, and what to do,
 * and carries the facts as fields so callers (command line, widgets) can format them.
 */

/** Base class of every error fringekit throws on purpose. `code` is stable and machine-readable. */
export class FringekitError extends Error {
  readonly code: string;
  constructor(code: string, message: string) {
    super(message);
    this.name = "FringekitError";
    this.code = code;
  }
}

/**
 * An argument or option has a value that is not allowed.
 * Message form: "invalid {argument}: {value} ({allowed})".
 */
export class InvalidArgumentError extends FringekitError {
  readonly argument: string;
  readonly value: unknown;
  readonly allowed: string;
  constructor(argument: string, value: unknown, allowed: string) {
    super("invalid-argument", `invalid ${argument}: ${formatValue(value)} (${allowed})`);
    this.name = "InvalidArgumentError";
    this.argument = argument;
    this.value = value;
    this.allowed = allowed;
  }
}

/**
 * Input data (a file's bytes or text) cannot be used.
 * `source` names the file, `line` (1-based) the line where there is one, `hint` what to do.
 */
export class DataError extends FringekitError {
  readonly source: string;
  readonly line: number | undefined;
  readonly hint: string;
  constructor(source: string, problem: string, hint: string, line?: number) {
    super("bad-data", `${source}${line !== undefined ? `:${line}` : ""}: ${problem}; ${hint}`);
    this.name = "DataError";
    this.source = source;
    this.line = line;
    this.hint = hint;
  }
}

function formatValue(value: unknown): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (typeof value === "number" || typeof value === "boolean" || value === null || value === undefined) {
    return String(value);
  }
  try {
    const text = JSON.stringify(value);
    return text.length > 80 ? `${text.slice(0, 77)}...` : text;
  } catch {
    return Object.prototype.toString.call(value);
  }
}
