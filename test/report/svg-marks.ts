/**
 * Test helper: the drawn marks of a Vega SVG. Vega writes each mark set as
 * `<g class="mark-<type> role-mark <name>">` whose children are one element per mark item.
 */
export interface MarkSet {
  readonly type: string;
  readonly name: string;
  /** Number of drawn elements (path, line, rect, text) in the set. */
  readonly items: number;
}

/** Every mark set (data marks only, not axes or legends) of a Vega SVG, in document order. */
export function markSets(svg: string): MarkSet[] {
  const sets: MarkSet[] = [];
  const opening = /<g class="mark-([a-z]+) role-mark ([^"]*)"[^>]*>/g;
  for (const match of svg.matchAll(opening)) {
    const start = match.index! + match[0].length;
    const end = svg.indexOf("</g>", start);
    const body = svg.slice(start, end);
    const items = (body.match(/<(path|line|rect|text)\b/g) ?? []).length;
    sets.push({ type: match[1], name: match[2], items });
  }
  return sets;
}

/** The text content of every <text> element of an SVG (axis titles, labels, headings, legends). */
export function svgTexts(svg: string): string[] {
  return [...svg.matchAll(/<text\b[^>]*>([^<]*)<\/text>/g)].map((m) =>
    m[1].replace(/&amp;/g, "&").replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"').replace(/&#39;/g, "'"),
  );
}

/** Width and height from the IHDR chunk of a PNG (PNG specification, W3C 2003, section 11.2.2). */
export function pngSize(png: Uint8Array): { width: number; height: number } {
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  return { width: view.getUint32(16), height: view.getUint32(20) };
}

/** The eight-byte PNG signature (PNG specification, W3C 2003, section 5.2). */
export const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
