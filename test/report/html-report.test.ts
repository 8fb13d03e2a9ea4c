import { beforeAll, describe, expect, it } from "vitest";
import { htmlReport, reportWarnings } from "../../src/report/html-report.js";
import { inlineSvg } from "../../src/report/inline-svg.js";
import { renderSvg } from "../../src/report/render-figure.js";
import { reportFigures } from "../../src/report/report-figures.js";
import { inventedReportInput } from "./invented-input.js";

const input = inventedReportInput({
  warnings: ["Timescale <tau> is poorly constrained & may be biased."],
});
let html = "";
let figureIds: string[] = [];

beforeAll(async () => {
  const figures = reportFigures(input);
  figureIds = figures.map((f) => f.id);
  const drawn = [];
  for (const figure of figures) drawn.push({ figure, svg: await renderSvg(figure) });
  html = htmlReport(input, drawn);
});

describe("htmlReport", () => {
  it("contains every figure inline, each with its caption", () => {
    expect(figureIds).toEqual(["light-curve", "corner", "spectrum", "traces"]);
    for (const id of figureIds) {
      expect(html).toContain(`<figure id="figure-${id}">`);
      expect(html).toContain(`data-figure="figure-${id}"`);
      expect(html).toContain(`figures/${id}.png`);
    }
    expect(html.match(/<svg\b/g)).toHaveLength(figureIds.length);
    expect(html.match(/<figcaption>/g)).toHaveLength(figureIds.length);
  });
  it("is self-contained: no script, no stylesheet link, no remote resource, and a policy forbidding any", () => {
    expect(html).not.toMatch(/<script\b/i);
    expect(html).not.toMatch(/<link\b/i);
    expect(html).not.toMatch(/<img\b/i);
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//i);
    expect(html).not.toMatch(/url\((['"]?)(https?:)?\/\//i);
    expect(html).toContain(`content="default-src 'none'; style-src 'unsafe-inline'; img-src data:"`);
  });
  it("keeps element ids unique across the page, so one figure's clip paths cannot clip another's", () => {
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
    for (const ref of html.matchAll(/url\(#([^)]+)\)/g)) expect(ids).toContain(ref[1]);
  });
  it("shows the warnings first and escapes their text", () => {
    const warningsAt = html.indexOf('id="warnings"');
    expect(warningsAt).toBeGreaterThan(0);
    expect(warningsAt).toBeLessThan(html.indexOf('id="summary"'));
    expect(warningsAt).toBeLessThan(html.indexOf("<figure"));
    expect(html).toContain("Timescale &lt;tau&gt; is poorly constrained &amp; may be biased.");
    expect(html).not.toContain("<tau>");
    expect(html).toContain('role="alert"');
  });
  it("has the summary, the parameter table and the diagnostics", () => {
    expect(html).toContain("Fitted model: a damped random walk.");
    for (const name of Object.keys(input.result.parameters)) expect(html).toContain(`<span class="name">${name}</span>`);
    expect(html).toContain("Largest rank-normalised split R-hat");
    expect(html).toContain("<td>1.006</td>");
  });
  it("says so when there are no warnings", async () => {
    const quiet = inventedReportInput({ warnings: [], chains: 2, steps: 40 });
    const page = htmlReport(quiet, []);
    expect(page).toContain("None: the fit raised no warnings.");
    expect(page).not.toContain('role="alert"');
  });
});

describe("reportWarnings", () => {
  it("adds a convergence warning unless the result already has one", () => {
    const base = inventedReportInput({ warnings: ["Short baseline."], chains: 2, steps: 40 });
    const stuck = { ...base, result: { ...base.result, diagnostics: { ...base.result.diagnostics, converged: false, rhatMax: 1.31 } } };
    expect(reportWarnings(stuck)[0]).toBe(
      "The sampler did not converge (largest R-hat 1.31): the posterior summaries are not reliable.",
    );
    expect(reportWarnings(stuck)).toHaveLength(2);
    const said = { ...stuck, result: { ...stuck.result, warnings: ["Chains did not converge."] } };
    expect(reportWarnings(said)).toEqual(["Chains did not converge."]);
    expect(reportWarnings(base)).toEqual(["Short baseline."]);
  });
});

describe("inlineSvg", () => {
  it("prefixes ids and their references and labels the root", () => {
    const svg = '<svg xmlns="http://www.w3.org/2000/svg"><clipPath id="clip1"><rect/></clipPath><clipPath id="clip10"><rect/></clipPath><g clip-path="url(#clip1)"/><g clip-path="url(#clip10)"/></svg>';
    const out = inlineSvg(svg, "figure-a", 'Light "curve"');
    expect(out).toContain('id="figure-a-clip1"');
    expect(out).toContain('id="figure-a-clip10"');
    expect(out).toContain("url(#figure-a-clip1)");
    expect(out).toContain("url(#figure-a-clip10)");
    expect(out).not.toMatch(/id="clip/);
    expect(out.startsWith('<svg role="img" aria-label="Light &quot;curve&quot;" data-figure="figure-a"')).toBe(true);
  });
});
