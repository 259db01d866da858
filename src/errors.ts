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
    super("invalid-argument", `invalid ${safeText(argument, 80)}: ${formatValue(value)} (${safeText(allowed, 300)})`);
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
    super("bad-data", `${safeText(source, 200)}${line !== undefined ? `:${line}` : ""}: ${safeText(problem, 400)}; ${safeText(hint, 300)}`);
    this.name = "DataError";
    this.source = source;
    this.line = line;
    this.hint = hint;
  }
}

/** Control characters: C0, DEL and C1 (ECMA-48 escape sequences start with ESC 0x1b or CSI 0x9b), and line/paragraph separators. */
const CONTROL = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g;

/**
 * `text` safe to print on a terminal in one line: control characters become `\xNN` (or
 * `\uNNNN`) escapes and text longer than `max` characters is cut, saying how long it was.
 * @param text any text, e.g. quoted from a file
 * @param max  largest number of characters kept
 */
export function safeText(text: string, max = 200): string {
  const str = String(text);
  const cut = str.length > max ? `${str.slice(0, max)}… (${str.length} characters)` : str;
  return cut.replace(CONTROL, (c) => {
    const code = c.charCodeAt(0);
    return code <= 0xff ? `\\x${code.toString(16).padStart(2, "0")}` : `\\u${code.toString(16).padStart(4, "0")}`;
  });
}

function formatValue(value: unknown): string {
  if (typeof value === "string") return value.length > 160 ? `${JSON.stringify(value.slice(0, 160)).replace(CONTROL, "?")}… (${value.length} characters)` : JSON.stringify(value).replace(CONTROL, "?");
  if (typeof value === "number" || typeof value === "boolean" || value === null || value === undefined) {
    return String(value);
  }
  try {
    const text = JSON.stringify(value) ?? String(value);
    return safeText(text.length > 80 ? `${text.slice(0, 77)}...` : text, 100);
  } catch {
    return Object.prototype.toString.call(value);
  }
}
