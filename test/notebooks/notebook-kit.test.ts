import { describe, expect, it } from "vitest";
import { renderMarkdown, renderInline } from "../../notebooks-ts/kit/markdown.js";
import { instrumentNotebook, notebookCells } from "../../notebooks-ts/kit/notebook-cells.js";
import { notebookPage, notebookTitle } from "../../notebooks-ts/kit/notebook-page.js";

const SOURCE = [
  "/* md",
  "# A title",
  "",
  "Some *prose* with `code`.",
  "*/",
  'import { x } from "./x.js";',
  "const a = 1;",
  "",
  "// %%",
  "console.log(a);",
  "/* md",
  "## Next",
  "*/",
  "",
].join("\n");

describe("notebook cells", () => {
  it("splits prose blocks, code cells and // %% markers, numbering code cells from 0", () => {
    const cells = notebookCells(SOURCE);
    expect(cells.map((c) => c.kind)).toEqual(["markdown", "code", "code", "markdown"]);
    expect(cells[1]).toMatchObject({ kind: "code", index: 0, text: 'import { x } from "./x.js";\nconst a = 1;', firstLine: 5, lastLine: 6 });
    expect(cells[2]).toMatchObject({ kind: "code", index: 1, text: "console.log(a);", firstLine: 9 });
    expect(cells[3]).toMatchObject({ kind: "markdown", text: "## Next" });
  });

  it("refuses a prose block that is never closed", () => {
    expect(() => notebookCells("/* md\n# open")).toThrow(SyntaxError);
  });

  it("instruments each code cell on its own first line, keeping every line in place", () => {
    const lines = instrumentNotebook(SOURCE, "./kit/notebook-output.js", "/nb/a.ts", "/out").split("\n");
    expect(lines[0]).toMatch(/^import \{ beginCell as __beginCell, .*\} from "\.\/kit\/notebook-output\.js"; \/\* md$/);
    expect(lines[5]).toBe('__beginCell(0); import { x } from "./x.js";');
    expect(lines[9]).toBe("__beginCell(1); console.log(a);");
    expect(lines[SOURCE.split("\n").length]).toBe('await __finishNotebook("/nb/a.ts", "/out");');
  });
});

describe("instrumented imports", () => {
  it("rewrites relative module specifiers in code, never in prose", () => {
    const source = ['/* md', 'See "./x.js" from "../y.js".', '*/', 'import { a } from "./kit/a.js";', "import {", "  b,", '} from "../src/b.js";', 'const c = await import("./c.js");'].join("\n");
    const out = instrumentNotebook(source, "file:///kit.js", "/nb/n.ts", "/out", (s) => `file:///abs/${s.replace(/^\.{1,2}\//, "")}`).split("\n");
    expect(out[1]).toBe('See "./x.js" from "../y.js".');
    expect(out[3]).toBe('__beginCell(0); import { a } from "file:///abs/kit/a.js";');
    expect(out[6]).toBe('} from "file:///abs/src/b.js";');
    expect(out[7]).toBe('const c = await import("file:///abs/c.js");');
  });
});

describe("markdown", () => {
  it("renders headings, paragraphs, lists, code and tables, escaping HTML", () => {
    const html = renderMarkdown("# T <1>\n\npara **b** and [l](u)\n\n- one\n- two\n\n```\nx < y\n```\n\n| a | b |\n| --- | --- |\n| 1 | 2 |");
    expect(html).toContain('<h1 id="t-1">T &lt;1&gt;</h1>');
    expect(html).toContain('<p>para <strong>b</strong> and <a href="u">l</a></p>');
    expect(html).toContain("<ul><li>one</li><li>two</li></ul>");
    expect(html).toContain("<pre><code>x &lt; y</code></pre>");
    expect(html).toContain("<thead><tr><th>a</th><th>b</th></tr></thead><tbody><tr><td>1</td><td>2</td></tr></tbody>");
  });

  it("keeps inline code literal", () => {
    expect(renderInline("`a*b*c` and *d*")).toBe("<code>a*b*c</code> and <em>d</em>");
  });
});

describe("notebook page", () => {
  it("takes the title from the first heading and shows outputs under their cell", () => {
    const cells = notebookCells(SOURCE);
    expect(notebookTitle(cells, "fallback")).toBe("A title");
    const html = notebookPage({
      name: "a",
      cells,
      outputs: new Map([[1, [{ kind: "text", text: "1 <b>" }]]]),
      cellSeconds: new Map([[0, 0.01], [1, 2.5]]),
      figures: new Map(),
      seconds: 3,
    });
    expect(html).toContain("<title>A title</title>");
    expect(html).toContain('<pre class="out">1 &lt;b&gt;</pre>');
    expect(html.indexOf("console.log(a);")).toBeLessThan(html.indexOf("1 &lt;b&gt;"));
    expect(html).toContain("Content-Security-Policy");
  });

  it("joins consecutive printed lines of a cell into one box", () => {
    const html = notebookPage({
      name: "a",
      cells: notebookCells(SOURCE),
      outputs: new Map([[0, [{ kind: "text", text: "one" }, { kind: "text", text: "two" }]]]),
      cellSeconds: new Map(),
      figures: new Map(),
      seconds: 1,
    });
    expect(html).toContain('<pre class="out">one\ntwo</pre>');
  });
});
