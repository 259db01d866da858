/**
 * Turning what tslab's executor reports into Jupyter error content {ename, evalue, traceback}
 * (messaging spec 5.3, "Execution errors").
 */
import { format, inspect } from "node:util";

/** Content of an iopub `error` message and of an error reply. */
export interface ErrorContent {
  ename: string;
  evalue: string;
  traceback: string[];
}

/**
 * Error content from the argument lists tslab's executor passed to `console.error`:
 * a compile diagnostic is ("%s%d:%d - %s", file, line, column, text); a runtime failure is
 * (thrownValue).
 */
export function errorContentFrom(reports: readonly unknown[][]): ErrorContent {
  if (reports.length === 0) return { ename: "Error", evalue: "the cell failed without an error message", traceback: [] };
  const diagnostics = reports.filter((args) => args[0] === "%s%d:%d - %s");
  if (diagnostics.length > 0) {
    const lines = diagnostics.map((args) => format(...args));
    const first = diagnostics[0];
    return { ename: "TypeScriptError", evalue: `${first[1]}${Number(first[2])}:${Number(first[3])} - ${String(first[4])}`, traceback: lines };
  }
  return errorContentOf(reports[reports.length - 1].length === 1 ? reports[reports.length - 1][0] : format(...reports[reports.length - 1]));
}

/** Error content for a thrown value. */
export function errorContentOf(thrown: unknown): ErrorContent {
  if (thrown instanceof Error || (thrown !== null && typeof thrown === "object" && "message" in thrown && "name" in thrown)) {
    const error = thrown as Error;
    const stack = typeof error.stack === "string" && error.stack !== "" ? error.stack : `${error.name}: ${error.message}`;
    return { ename: String(error.name || "Error"), evalue: String(error.message ?? ""), traceback: userFrames(stack.split("\n")) };
  }
  const text = typeof thrown === "string" ? thrown : inspect(thrown);
  return { ename: "Error", evalue: text, traceback: [`Uncaught ${text}`] };
}

/** Drops the kernel's own frames (vm, tslab, fringekit's server) that follow the cell's frames. */
function userFrames(lines: string[]): string[] {
  const cut = lines.findIndex((line) => /^\s+at .*(node:vm|sigintHandlersWrap|tslab[\\/]dist[\\/]executor)/.test(line));
  return cut > 0 ? lines.slice(0, cut) : lines;
}
