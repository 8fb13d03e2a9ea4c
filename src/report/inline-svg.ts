/**
 * An SVG document prepared for inlining in an HTML page beside other SVGs: every `id` (clip paths,
 * gradients) and every reference to it gets a per-figure prefix, because ids are global to the page and
 * two figures with a "clip1" would otherwise clip each other's marks. The root element gains a role, an
 * accessible label and a `data-figure` attribute naming the figure.
 */
export function inlineSvg(svg: string, prefix: string, label: string): string {
  const body = svg.replace(/^<\?xml[^>]*>\s*/, "");
  const ids = new Set<string>();
  for (const match of body.matchAll(/\sid="([^"]+)"/g)) ids.add(match[1]);
  let out = body;
  for (const id of ids) {
    const escaped = id.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
    out = out
      .replace(new RegExp(`(\\sid=")${escaped}"`, "g"), `$1${prefix}-${id}"`)
      .replace(new RegExp(`url\\(#${escaped}\\)`, "g"), `url(#${prefix}-${id})`)
      .replace(new RegExp(`(href=")#${escaped}"`, "g"), `$1#${prefix}-${id}"`);
  }
  return out.replace(/^<svg\b/, `<svg role="img" aria-label="${attribute(label)}" data-figure="${attribute(prefix)}"`);
}

function attribute(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/"/g, "&quot;").replace(/</g, "&lt;");
}
