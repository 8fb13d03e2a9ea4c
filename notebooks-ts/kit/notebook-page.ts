/**
 * The HTML page of an executed notebook: prose rendered from Markdown, each code cell with what it
 * printed, tabulated and drew underneath, figures as inline SVG. Self-contained (styles inline, no
 * script, a Content-Security-Policy forbidding any fetch), so it opens from a file or a CI artifact.
 */
import { inlineSvg } from "../../src/report/inline-svg.js";
import { selfContainedPageOpening } from "../../src/report/self-contained-page.js";
import { HOROLOGIUM_VERSION } from "../../src/version.js";
import { escapeHtml, renderMarkdown } from "./markdown.js";
import type { NotebookCell } from "./notebook-cells.js";

/** One output of a code cell. */
export type CellOutput =
  | { readonly kind: "text"; readonly text: string }
  | { readonly kind: "table"; readonly rows: readonly Readonly<Record<string, string | number | boolean>>[]; readonly caption: string }
  | { readonly kind: "figure"; readonly id: string; readonly caption: string };

/** Everything the page shows. */
export interface NotebookPageInput {
  readonly name: string;
  readonly cells: readonly NotebookCell[];
  /** Outputs by code-cell index. */
  readonly outputs: ReadonlyMap<number, readonly CellOutput[]>;
  /** Wall-clock seconds by code-cell index. */
  readonly cellSeconds: ReadonlyMap<number, number>;
  /** SVG text by figure id. */
  readonly figures: ReadonlyMap<string, string>;
  /** Wall-clock seconds of the whole run. */
  readonly seconds: number;
}

/** The page's title: the first heading of the prose, else the notebook's name. */
export function notebookTitle(cells: readonly NotebookCell[], name: string): string {
  for (const cell of cells) {
    if (cell.kind !== "markdown") continue;
    const heading = /^#\s+(.+)$/m.exec(cell.text);
    if (heading) return heading[1].trim();
  }
  return name;
}

/** Renders the executed notebook as one HTML page. */
export function notebookPage(input: NotebookPageInput): string {
  const title = notebookTitle(input.cells, input.name);
  let figureNumber = 0;
  const outputHtml = (output: CellOutput): string => {
    switch (output.kind) {
      case "text":
        return `<pre class="out">${escapeHtml(output.text)}</pre>`;
      case "table":
        return tableHtml(output.rows, output.caption);
      case "figure": {
        figureNumber++;
        const svg = input.figures.get(output.id);
        const drawn = svg === undefined ? "<p class=\"error\">(figure missing)</p>" : inlineSvg(svg, `fig-${output.id}`, output.caption);
        return `<figure id="${escapeHtml(output.id)}">${drawn}<figcaption><strong>Figure ${figureNumber}.</strong> ${escapeHtml(output.caption)}</figcaption></figure>`;
      }
    }
  };
  const body = input.cells
    .map((cell) => {
      if (cell.kind === "markdown") return `<section class="prose">${renderMarkdown(cell.text)}</section>`;
      const outputs = mergeText(input.outputs.get(cell.index) ?? []);
      const seconds = input.cellSeconds.get(cell.index);
      const timing = seconds === undefined ? "" : `<span class="time">${seconds < 0.1 ? "&lt;0.1" : seconds.toFixed(1)} s</span>`;
      return (
        `<section class="cell"><div class="code"><div class="label">[${cell.index + 1}] ${timing}</div>` +
        `<pre><code>${escapeHtml(cell.text)}</code></pre></div>` +
        (outputs.length > 0 ? `<div class="outputs">${outputs.map(outputHtml).join("\n")}</div>` : "") +
        `</section>`
      );
    })
    .join("\n");
  return `${selfContainedPageOpening({ title, generator: `Horologium ${HOROLOGIUM_VERSION} notebooks`, style: STYLE })}
<p class="meta">Horologium ${escapeHtml(HOROLOGIUM_VERSION)} · notebook <code>notebooks-ts/${escapeHtml(input.name)}.ts</code> · run in ${input.seconds.toFixed(0)} s · all data invented (Lanternfield Deep Survey)</p>
${body}
</main>
</body>
</html>
`;
}

/** Consecutive printed lines of a cell share one box. */
function mergeText(outputs: readonly CellOutput[]): CellOutput[] {
  const merged: CellOutput[] = [];
  for (const output of outputs) {
    const last = merged[merged.length - 1];
    if (output.kind === "text" && last?.kind === "text") merged[merged.length - 1] = { kind: "text", text: `${last.text}\n${output.text}` };
    else merged.push(output);
  }
  return merged;
}

function tableHtml(rows: readonly Readonly<Record<string, string | number | boolean>>[], caption: string): string {
  if (rows.length === 0) return "";
  const columns = Object.keys(rows[0]);
  const numeric = (value: unknown) => typeof value === "number" || /^[−+\-]?[\d.]/.test(String(value));
  const head = `<tr>${columns.map((c) => `<th>${escapeHtml(c)}</th>`).join("")}</tr>`;
  const bodyRows = rows
    .map((row) => `<tr>${columns.map((c) => `<td${numeric(row[c]) ? ' class="num"' : ""}>${escapeHtml(String(row[c] ?? ""))}</td>`).join("")}</tr>`)
    .join("");
  return `<table>${caption ? `<caption>${escapeHtml(caption)}</caption>` : ""}<thead>${head}</thead><tbody>${bodyRows}</tbody></table>`;
}

const STYLE = `
body { font-family: "DejaVu Sans", Verdana, sans-serif; color: #1a1a1a; background: #fff; margin: 0; line-height: 1.5; }
main { max-width: 900px; margin: 0 auto; padding: 1.5rem 1.25rem 4rem; }
.meta { color: #666; font-size: 0.85rem; border-bottom: 1px solid #ddd; padding-bottom: 0.5rem; }
h1 { font-size: 1.6rem; margin: 1rem 0 0.5rem; }
h2 { font-size: 1.25rem; margin: 1.75rem 0 0.5rem; border-bottom: 1px solid #eee; }
h3 { font-size: 1.05rem; margin: 1.25rem 0 0.4rem; }
code { font-family: "DejaVu Sans Mono", monospace; font-size: 0.88em; background: #f4f4f4; padding: 0 0.2em; border-radius: 3px; }
pre { overflow-x: auto; }
pre code { background: none; padding: 0; }
.cell { margin: 0.75rem 0 1.25rem; }
.code { border-left: 3px solid #1f5fa8; background: #f7f9fc; padding: 0.25rem 0.75rem; }
.code pre { margin: 0.25rem 0; font-size: 0.82rem; line-height: 1.35; }
.label { font-size: 0.75rem; color: #1f5fa8; font-family: "DejaVu Sans Mono", monospace; }
.time { color: #888; margin-left: 0.5rem; }
.outputs { padding: 0.25rem 0 0 0.9rem; }
pre.out { background: #fbfbfb; border: 1px solid #eee; padding: 0.4rem 0.6rem; font-size: 0.82rem; margin: 0.4rem 0; white-space: pre-wrap; }
table { border-collapse: collapse; margin: 0.6rem 0; font-size: 0.88rem; }
caption { text-align: left; color: #444; font-size: 0.85rem; padding-bottom: 0.25rem; }
th, td { border-bottom: 1px solid #e2e2e2; padding: 0.2rem 0.6rem; text-align: left; vertical-align: top; }
td.num { font-variant-numeric: tabular-nums; }
th { border-bottom: 2px solid #bbb; }
figure { margin: 0.8rem 0; }
figure svg { max-width: 100%; height: auto; }
figcaption { font-size: 0.88rem; color: #333; margin-top: 0.3rem; }
blockquote { border-left: 3px solid #ccc; margin: 0.5rem 0; padding: 0 0.8rem; color: #444; }
.error { color: #b00020; }
`;
