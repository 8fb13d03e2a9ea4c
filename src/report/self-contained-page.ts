import { escapeHtml } from "./html-escape.js";

/** What the head of a self-contained page says: its title, the program that wrote it and its styles. */
export interface SelfContainedPageHead {
  readonly title: string;
  /** The `generator` meta tag, for example "Horologium 0.1.0". */
  readonly generator: string;
  /** The page's whole style sheet, inlined. */
  readonly style: string;
}

/**
 * The opening of a self-contained HTML page, up to and including `<main>`: styles inline, and a
 * Content-Security-Policy that forbids every fetch (inline styles and data: images only), so the page
 * opens from a file or a CI artifact and reaches nothing. Shared by the report (html-report.ts) and the
 * executed notebooks; the title and generator are escaped here.
 */
export function selfContainedPageOpening({ title, generator, style }: SelfContainedPageHead): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="${escapeHtml(generator)}">
<title>${escapeHtml(title)}</title>
<style>${style}</style>
</head>
<body>
<main>`;
}
