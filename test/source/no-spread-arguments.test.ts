import { readFileSync } from "node:fs";
import { relative } from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";
import { SOURCE_ROOT, sourceFiles } from "./source-files.js";

/**
 * No source spreads an array into the arguments of a call (`Math.max(...xs)`, `push(...xs)`,
 * `f.apply(this, xs)`): every argument is a slot on the stack, and V8 throws "Maximum call stack size
 * exceeded" somewhere above ~1e5 of them, so a light curve of 2e5 points ended in an internal error
 * (issue 12). The rule holds for every spread, bounded or not, so that nobody has to judge which arrays
 * can grow. Checked on the TypeScript syntax tree, not by text search.
 */
/** `file:line: text` of every spread argument and every `.apply(...)` call in one source text. */
function spreadArguments(fileName: string, text: string): string[] {
  const source = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true);
  const found: string[] = [];
  const report = (node: ts.Node) => {
    const { line } = source.getLineAndCharacterOfPosition(node.getStart(source));
    found.push(`${fileName}:${line + 1}: ${node.getText(source).slice(0, 80)}`);
  };
  const visit = (node: ts.Node) => {
    if (ts.isCallExpression(node) || ts.isNewExpression(node)) {
      for (const argument of node.arguments ?? []) if (ts.isSpreadElement(argument)) report(argument);
      const callee = node.expression;
      if (ts.isCallExpression(node) && ts.isPropertyAccessExpression(callee) && callee.name.text === "apply" && node.arguments.length === 2) {
        report(node);
      }
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

describe("no array spread into call arguments", () => {
  it("the checker finds spreads and apply, and not array literals, rest parameters or object spreads", () => {
    const sample = [
      "const a = Math.max(...xs);",
      "list.push(1, ...more);",
      "new Float64Array(...parts);",
      "Math.min.apply(null, xs);",
      "const b = [...xs];",
      "const c = { ...options };",
      "function f(...rest: number[]) { return rest; }",
      "const [head, ...tail] = xs;",
    ].join("\n");
    expect(spreadArguments("sample.ts", sample).map((s) => s.split(":")[1])).toEqual(["1", "2", "3", "4"]);
  });

  it("no file in src/ has one", () => {
    const found = sourceFiles(SOURCE_ROOT).flatMap((path) => spreadArguments(relative(SOURCE_ROOT, path), readFileSync(path, "utf8")));
    expect(found).toEqual([]);
  });
});
