import { readFileSync } from "node:fs";
import { relative } from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";
import { SOURCE_ROOT, sourceFiles } from "./source-files.js";

/**
 * One rule for indexed access (DEVELOPERS.md, "Conventions"): the compiler runs without
 * `noUncheckedIndexedAccess`, so `xs[i]` has the element's type and a non-null assertion after it
 * (`xs[i]!`) asserts nothing; loops are bounded by the lengths they index, and a lookup that can miss
 * (a Map, a record keyed by user input) is tested with `=== undefined` or `??`, never asserted.
 * Checked on the TypeScript syntax tree.
 */
function assertedIndexing(fileName: string, text: string): string[] {
  const source = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true);
  const found: string[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isNonNullExpression(node) && ts.isElementAccessExpression(node.expression)) {
      const { line } = source.getLineAndCharacterOfPosition(node.getStart(source));
      found.push(`${fileName}:${line + 1}: ${node.getText(source).slice(0, 80)}`);
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

describe("indexed access without non-null assertions", () => {
  it("the checker finds xs[i]! and not other assertions or comparisons", () => {
    const sample = ["const a = xs[i]!;", "const b = m.get(k)!;", "if (xs[i] !== 0) f();", "const c = grid[i]![j]!;"].join("\n");
    expect(assertedIndexing("sample.ts", sample).map((s) => s.split(":")[1])).toEqual(["1", "4", "4"]);
  });

  it("no file in src/ has one", () => {
    const found = sourceFiles(SOURCE_ROOT).flatMap((path) => assertedIndexing(relative(SOURCE_ROOT, path), readFileSync(path, "utf8")));
    expect(found).toEqual([]);
  });
});
