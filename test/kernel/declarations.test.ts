// The declaration surface a notebook cell type-checks for `import ... from "fringekit"`: tslab's
// type-checker reads every .d.ts reachable from the entry's "types" file on the first such cell,
// so a dependency's types referenced from a public signature (mathjs's are ~250 KB) would be
// parsed and bound in every session. Checked on the built declarations with TypeScript's own
// program (the files TypeScript includes for a root file: TypeScript handbook, "Module
// Resolution" and "Triple-Slash Directives").
import { existsSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import ts from "typescript";
import { describe, expect, it } from "vitest";

const root = fileURLToPath(new URL("../../", import.meta.url));
const entry = path.join(root, "dist", "src", "index.d.ts");

function reachedDeclarations(rootFile: string): string[] {
  const program = ts.createProgram([rootFile], {
    noEmit: true, types: [], lib: ["lib.es2022.d.ts"], module: ts.ModuleKind.NodeNext, moduleResolution: ts.ModuleResolutionKind.NodeNext, skipLibCheck: true,
  });
  return program.getSourceFiles().filter((f) => !program.isSourceFileDefaultLibrary(f)).map((f) => path.relative(root, f.fileName).split(path.sep).join("/"));
}

describe("declarations of the \"fringekit\" entry", () => {
  it("reachedDeclarations(dist/src/index.d.ts) are fringekit's own files, no dependency's types", () => {
    if (!existsSync(entry)) throw new Error("declarations.test needs the build: run `npm run build` first");
    const files = reachedDeclarations(entry);
    expect(files.length).toBeGreaterThan(10); // the curated API spans several folders
    expect(files.filter((f) => !f.startsWith("dist/src/"))).toEqual([]);
  });
});
