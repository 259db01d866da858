/**
 * is_complete for TypeScript cells: tslab decides complete/incomplete (open brackets, trailing
 * operators); code that is complete but does not parse is "invalid" (messaging spec 5.3,
 * "Code completeness").
 */

/** What the check needs from the TypeScript module tslab uses. */
export interface TranspileApi {
  transpileModule(input: string, options: { reportDiagnostics: boolean; compilerOptions: Record<string, unknown> }): { diagnostics?: readonly unknown[] };
  ScriptTarget: { ES2022: number };
  ModuleKind: { ESNext: number };
}

/** is_complete_reply content. */
export type CompletenessReply = { status: "complete" } | { status: "invalid" } | { status: "incomplete"; indent: string };

/** Classifies `code` as complete, incomplete (with indent) or invalid. */
export function checkCompleteness(
  code: string,
  isCompleteCode: (code: string) => { completed: boolean; indent: string },
  ts: TranspileApi,
): CompletenessReply {
  const tslabSays = isCompleteCode(code);
  if (!tslabSays.completed) return { status: "incomplete", indent: tslabSays.indent ?? "" };
  // "export {}" makes the cell a module, so top-level await parses as in the kernel.
  const result = ts.transpileModule(`export {};\n${code}`, {
    reportDiagnostics: true,
    compilerOptions: { target: ts.ScriptTarget.ES2022, module: ts.ModuleKind.ESNext },
  });
  return (result.diagnostics ?? []).length > 0 ? { status: "invalid" } : { status: "complete" };
}
