/**
 * A small Markdown-to-HTML renderer for the notebooks' prose: headings, paragraphs, bullet and numbered
 * lists, fenced code, pipe tables, block quotes, and inline code, bold, italic and links. It is not a
 * full CommonMark implementation; it covers what the notebooks write, and escapes everything else.
 */

/** Escapes the five characters that matter in HTML text and attributes. */
export function escapeHtml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}

/** Inline markup: `code` first (its content is literal), then links, bold and italic. */
export function renderInline(text: string): string {
  const pieces = text.split(/(`[^`]+`)/g);
  return pieces
    .map((piece) => {
      if (piece.startsWith("`") && piece.endsWith("`") && piece.length > 1) return `<code>${escapeHtml(piece.slice(1, -1))}</code>`;
      return escapeHtml(piece)
        .replace(/\[([^\]]+)\]\(([^)\s]+)\)/g, (_, label: string, href: string) => `<a href="${href}">${label}</a>`)
        .replace(/\*\*([^*]+)\*\*/g, "<strong>$1</strong>")
        .replace(/(^|[^*\w])\*([^*\s][^*]*?)\*(?!\w)/g, "$1<em>$2</em>")
        .replace(/(^|[^\w])_([^_\s][^_]*?)_(?!\w)/g, "$1<em>$2</em>");
    })
    .join("");
}

type Block =
  | { kind: "heading"; level: number; text: string }
  | { kind: "paragraph"; lines: string[] }
  | { kind: "list"; ordered: boolean; items: string[] }
  | { kind: "code"; lines: string[] }
  | { kind: "table"; rows: string[][] }
  | { kind: "quote"; lines: string[] };

/** Splits Markdown source into blocks; a blank line ends a paragraph, list, table or quote. */
function blocksOf(source: string): Block[] {
  const lines = source.replace(/\r\n?/g, "\n").split("\n");
  const blocks: Block[] = [];
  let i = 0;
  while (i < lines.length) {
    const line = lines[i];
    if (line.trim() === "") {
      i++;
      continue;
    }
    if (line.trimStart().startsWith("```")) {
      const code: string[] = [];
      i++;
      while (i < lines.length && !lines[i].trimStart().startsWith("```")) code.push(lines[i++]);
      i++;
      blocks.push({ kind: "code", lines: code });
      continue;
    }
    const heading = /^(#{1,6})\s+(.*)$/.exec(line);
    if (heading) {
      blocks.push({ kind: "heading", level: heading[1].length, text: heading[2].trim() });
      i++;
      continue;
    }
    if (/^\s*\|/.test(line)) {
      const rows: string[][] = [];
      while (i < lines.length && /^\s*\|/.test(lines[i])) {
        const cells = lines[i].trim().replace(/^\|/, "").replace(/\|$/, "").split("|").map((c) => c.trim());
        if (!cells.every((c) => /^:?-{3,}:?$/.test(c))) rows.push(cells);
        i++;
      }
      blocks.push({ kind: "table", rows });
      continue;
    }
    if (/^>\s?/.test(line)) {
      const quoted: string[] = [];
      while (i < lines.length && /^>\s?/.test(lines[i])) quoted.push(lines[i++].replace(/^>\s?/, ""));
      blocks.push({ kind: "quote", lines: quoted });
      continue;
    }
    const bullet = /^\s*([-*]|\d+\.)\s+(.*)$/.exec(line);
    if (bullet) {
      const ordered = /\d/.test(bullet[1]);
      const items: string[] = [];
      while (i < lines.length && lines[i].trim() !== "") {
        const item = /^\s*([-*]|\d+\.)\s+(.*)$/.exec(lines[i]);
        if (item) items.push(item[2]);
        else items[items.length - 1] += " " + lines[i].trim();
        i++;
      }
      blocks.push({ kind: "list", ordered, items });
      continue;
    }
    const paragraph: string[] = [];
    while (i < lines.length && lines[i].trim() !== "" && !/^(#{1,6}\s|```|\s*\||>)/.test(lines[i])) paragraph.push(lines[i++].trim());
    blocks.push({ kind: "paragraph", lines: paragraph });
  }
  return blocks;
}

/**
 * Renders Markdown to HTML. Headings get an id from their text so that pages can link to sections.
 *
 * @example renderMarkdown("# Title\n\nSome *text*.") // '<h1 id="title">Title</h1>\n<p>Some <em>text</em>.</p>'
 */
export function renderMarkdown(source: string): string {
  return blocksOf(source)
    .map((block) => {
      switch (block.kind) {
        case "heading": {
          const id = block.text.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "");
          return `<h${block.level} id="${id}">${renderInline(block.text)}</h${block.level}>`;
        }
        case "paragraph":
          return `<p>${renderInline(block.lines.join(" "))}</p>`;
        case "list": {
          const tag = block.ordered ? "ol" : "ul";
          return `<${tag}>${block.items.map((item) => `<li>${renderInline(item)}</li>`).join("")}</${tag}>`;
        }
        case "code":
          return `<pre><code>${escapeHtml(block.lines.join("\n"))}</code></pre>`;
        case "quote":
          return `<blockquote>${renderMarkdown(block.lines.join("\n"))}</blockquote>`;
        case "table": {
          const [head, ...body] = block.rows;
          const row = (cells: string[], tag: string) => `<tr>${cells.map((c) => `<${tag}>${renderInline(c)}</${tag}>`).join("")}</tr>`;
          return `<table>${head ? `<thead>${row(head, "th")}</thead>` : ""}<tbody>${body.map((r) => row(r, "td")).join("")}</tbody></table>`;
        }
      }
    })
    .join("\n");
}
