import type { FitDiagnostics, ParameterSummary } from "../models/fit-result.js";
import { sourceStem } from "./source-stem.js";
import { importanceFigures } from "../models/importance-figures.js";
import { convergenceFigure, formatAtDigit, formatMeasurement, formatSignificant, lastDigitPower } from "./format-measurement.js";
import { escapeHtml } from "./html-escape.js";
import { inlineSvg } from "./inline-svg.js";
import { parameterDisplay, timeUnitOf } from "./parameter-display.js";
import { plainSummary, RHAT_THRESHOLD } from "./plain-summary.js";
import { selfContainedPageOpening } from "./self-contained-page.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import { timeScaleName } from "./time-offset.js";

/** A figure with its SVG text: all the HTML page needs of a rendered figure. */
export interface DrawnFigure {
  readonly figure: ReportFigure;
  readonly svg: string;
}

/**
 * The warnings a reader must see first: those of the fit result, preceded by one about convergence
 * when the sampler did not converge and the result does not already say so.
 */
export function reportWarnings(input: ReportInput): string[] {
  const warnings = [...input.result.warnings];
  const d = input.result.diagnostics;
  if (!d.converged && !warnings.some((w) => /converge/i.test(w))) {
    warnings.unshift(
      `The sampler did not converge (${d.method === "importance" ? importanceFigures(d) : `largest R-hat ${convergenceFigure(d.rhatMax)}`}): the posterior summaries are not reliable.`,
    );
  }
  return warnings;
}

/** Options of {@link htmlReport}. */
export interface HtmlReportOptions {
  /** Whether the figures are also saved as SVG and PNG in `figures/` beside the page, as `writeReport` does (default true). */
  readonly figureFiles?: boolean;
}

/**
 * The report as one self-contained HTML page: styles inline, figures as inline SVG, no script and no
 * network access (a Content-Security-Policy forbids any), so it opens from a file, an e-mail or an archive.
 * Order: warnings, plain-language summary, parameter table, figures, diagnostics, data.
 */
export function htmlReport(input: ReportInput, figures: readonly DrawnFigure[], options: HtmlReportOptions = {}): string {
  const files = options.figureFiles ?? true;
  const { result, lightCurve } = input;
  const title = input.title ?? `${sourceStem(lightCurve.provenance.source)}${lightCurve.band ? `, band ${lightCurve.band}` : ""}: ${result.model}`;
  const warnings = reportWarnings(input);
  const byId = new Map(figures.map((f) => [f.figure.id, f]));
  const figure = (id: string) => {
    const drawn = byId.get(id);
    return drawn === undefined ? "" : figureHtml(drawn, files);
  };
  const others = figures.filter((f) => !["light-curve", "phase", "zoom", "corner", "spectrum", "traces", "importance-weights"].includes(f.figure.id));

  return `${selfContainedPageOpening({ title: `${title}: Horologium report`, generator: `Horologium ${result.version}`, style: STYLE })}
<header>
<h1>${escapeHtml(title)}</h1>
<p class="meta">Model <code>${escapeHtml(result.model)}</code> · seed <code>${escapeHtml(String(result.seed))}</code> · Horologium ${escapeHtml(result.version)}</p>
</header>
${warningsHtml(warnings)}
<section id="summary">
<h2>Summary</h2>
<p>${plainSummary(input).map(escapeHtml).join(" ")}</p>
</section>
<section id="parameters">
<h2>Parameters</h2>
${parameterTable(input)}
</section>
${derivedSection(input)}
${outlierSection(input)}
${figure("light-curve")}
${figure("phase")}
${figure("zoom")}
${figure("corner")}
${figure("spectrum")}
${figure("traces")}
${figure("importance-weights")}
${others.map((f) => figureHtml(f, files)).join("\n")}
<section id="diagnostics">
<h2>Sampler diagnostics</h2>
${diagnosticsTable(result.diagnostics)}
</section>
<section id="data">
<h2>Data</h2>
${dataTable(input)}
</section>
<footer>Made by Horologium ${escapeHtml(result.version)}.${files ? " Each figure is also saved as SVG and PNG in <code>figures/</code> beside this page." : ""}</footer>
</main>
</body>
</html>
`;
}

function warningsHtml(warnings: string[]): string {
  if (warnings.length === 0) {
    return `<section id="warnings" class="warnings none"><h2>Warnings</h2><p>None: the fit raised no warnings.</p></section>`;
  }
  const items = warnings.map((w) => `<li>${escapeHtml(w)}</li>`).join("\n");
  return `<section id="warnings" class="warnings" role="alert">
<h2><span aria-hidden="true">⚠</span> ${warnings.length === 1 ? "1 warning" : `${warnings.length} warnings`}</h2>
<ul>
${items}
</ul>
</section>`;
}

function figureHtml(drawn: DrawnFigure, files: boolean): string {
  const { figure } = drawn;
  const id = `figure-${figure.id}`;
  return `<figure id="${escapeHtml(id)}">
<h2>${escapeHtml(figure.title)}</h2>
<div class="figure-body">${inlineSvg(drawn.svg, id, figure.title)}</div>
<figcaption>${escapeHtml(figure.caption)}${files ? ` <span class="files">Files: <code>figures/${escapeHtml(figure.id)}.svg</code>, <code>figures/${escapeHtml(figure.id)}.png</code>.</span>` : ""}</figcaption>
</figure>`;
}

function parameterTable(input: ReportInput): string {
  const entries = Object.entries(input.result.parameters);
  const head = [
    "Parameter",
    "Unit",
    "Median and 68% interval",
    "95% interval",
    "Mean",
    "SD",
  ]
    .map((h) => `<th scope="col">${escapeHtml(h)}</th>`)
    .join("");
  const rows = entries.map(([name, s]) => {
    const display = parameterDisplay(input, name);
    const cells = [
      `<th scope="row">${escapeHtml(display.label)} <span class="name">${escapeHtml(name)}</span></th>`,
      `<td>${escapeHtml(display.unit === "" ? "–" : display.unit)}</td>`,
      `<td>${escapeHtml(formatMeasurement(s.median, s.median - s.q16, s.q84 - s.median))}</td>`,
      `<td>${escapeHtml(interval95(s))}</td>`,
      `<td>${escapeHtml(formatSignificant(s.mean, 4))}</td>`,
      `<td>${escapeHtml(formatSignificant(s.sd, 3))}</td>`,
    ];
    return `<tr>${cells.join("")}</tr>`;
  });
  return `<table class="numbers"><thead><tr>${head}</tr></thead><tbody>\n${rows.join("\n")}\n</tbody></table>`;
}

/** The 95% interval at the precision the smaller 68% error allows (Particle Data Group rounding). */
function interval95(s: ParameterSummary): string {
  const smaller = Math.min(s.median - s.q16, s.q84 - s.median);
  if (!(smaller > 0) || Math.abs(Math.log10(Math.max(Math.abs(s["q2.5"]), Math.abs(s["q97.5"]), smaller))) > 6) {
    return `${formatSignificant(s["q2.5"], 3)} to ${formatSignificant(s["q97.5"], 3)}`;
  }
  const power = lastDigitPower(smaller);
  return `${formatAtDigit(s["q2.5"], power)} to ${formatAtDigit(s["q97.5"], power)}`;
}

function derivedSection(input: ReportInput): string {
  const entries = Object.entries(input.result.derived);
  if (entries.length === 0) return "";
  const redshift = input.result.options.redshift;
  const rows = entries.map(([name, s]) => {
    const unit = derivedUnit(input, name);
    return `<tr><th scope="row">${escapeHtml(s.description)} <span class="name">${escapeHtml(name)}</span></th><td>${escapeHtml(unit === "" ? "–" : unit)}</td><td>${escapeHtml(formatMeasurement(s.median, s.median - s.q16, s.q84 - s.median))}</td><td>${escapeHtml(interval95(s))}</td></tr>`;
  });
  return `<section id="derived">
<h2>Derived quantities</h2>
<table class="numbers"><thead><tr><th scope="col">Quantity</th><th scope="col">Unit</th><th scope="col">Median and 68% interval</th><th scope="col">95% interval</th></tr></thead><tbody>
${rows.join("\n")}
</tbody></table>${redshift === undefined ? "" : `\n<p class="note">Rest-frame quantities use the redshift z = ${escapeHtml(formatSignificant(redshift, 4))} given to the fit (observed-frame time divided by 1 + z).</p>`}
</section>`;
}

/** Units of the derived quantities Horologium computes (timescales in the time unit, amplitudes in the value unit). */
function derivedUnit(input: ReportInput, name: string): string {
  if (/tau|period|time/i.test(name)) return timeUnitOf(input);
  if (/^sf|sigma|amplitude/i.test(name)) return input.lightCurve.unit === "mag" ? "mag" : "flux";
  return "";
}

/** Most outliers listed; more are counted. */
const MAX_OUTLIERS_LISTED = 100;

function outlierSection(input: ReportInput): string {
  const robust = input.result.robust;
  if (robust === undefined) return "";
  const { error } = input.lightCurve;
  const count = robust.likelyOutliers;
  const head = `<p>Noise: ${escapeHtml(robust.noise)}. ${count === 0 ? "No point is more likely than not an outlier." : `${count} point${count === 1 ? " is" : "s are"} more likely than not outliers (scatter beyond twice the error bar); the fit down-weights them rather than dropping them.`}</p>`;
  if (robust.flagged.length === 0) return `<section id="outliers">\n<h2>Outliers</h2>\n${head}\n</section>`;
  const rows = robust.flagged
    .slice(0, MAX_OUTLIERS_LISTED)
    .map(
      (p) =>
        `<tr><td>${escapeHtml(formatSignificant(p.time, 10))}</td><td>${escapeHtml(formatSignificant(p.value, 6))}</td><td>${error && p.index < error.length ? escapeHtml(formatSignificant(error[p.index], 3)) : "–"}</td><td>${escapeHtml(formatSignificant(p.weight, 3))}</td><td>${escapeHtml(formatSignificant(p.outlierProbability, 3))}</td></tr>`,
    );
  const listed = Math.min(MAX_OUTLIERS_LISTED, robust.flagged.length);
  const more = listed < count ? `\n<p class="note">${listed} of the ${count} are listed; the result JSON lists ${robust.flagged.length === count ? "every one" : `the ${robust.flagged.length} most probable`} (robust.flagged).</p>` : "";
  return `<section id="outliers">
<h2>Outliers</h2>
${head}
<table class="numbers narrow"><thead><tr><th scope="col">${escapeHtml(timeScaleName(input.lightCurve.provenance.timeColumn))} [${escapeHtml(timeUnitOf(input))}]</th><th scope="col">${escapeHtml(valueColumnTitle(input))}</th><th scope="col">Measured error</th><th scope="col">Weight</th><th scope="col">Outlier probability</th></tr></thead><tbody>
${rows.join("\n")}
</tbody></table>${more}
</section>`;
}

/** The value column's heading: "Magnitude [mag]" or "Flux". */
function valueColumnTitle(input: ReportInput): string {
  return input.lightCurve.unit === "mag" ? "Magnitude [mag]" : "Flux";
}

/** The sampler and how the run ended, in words. */
const DIAGNOSTIC_WORDS: Readonly<Record<string, Readonly<Record<string, string>>>> = {
  sampler: {
    ensemble: "walker ensemble (affine-invariant stretch moves)",
    nuts: "no-U-turn sampler (NUTS)",
  },
  stopReason: {
    converged: "stopped when every convergence criterion held",
    budget: "stopped at the evaluation budget, before convergence",
    cancelled: "cancelled before convergence",
  },
};

const DIAGNOSTIC_LABELS: Readonly<Record<string, string>> = {
  sampler: "Sampler",
  stopReason: "How the run ended",
  keptDraws: "Posterior draws kept for the summaries",
};

/** A camelCase key in words, for diagnostics a newer sampler may add: "warmupSteps" -> "Warmup steps". */
function keyInWords(key: string): string {
  const words = key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

function diagnosticsTable(d: FitDiagnostics): string {
  const importance = d.method === "importance";
  const known: [string, string, string][] = importance
    ? [
        ["Converged", d.converged ? "yes" : "no", d.converged ? "" : "bad"],
        ["Method", "Pareto-smoothed importance sampling", ""],
        ["Pareto k-hat of the weights", formatSignificant(d.paretoK ?? NaN, 3), (d.paretoK ?? Infinity) <= (d.paretoKThreshold ?? 0.7) ? "" : "bad"],
        ["k-hat threshold for this number of draws", formatSignificant(d.paretoKThreshold ?? NaN, 3), ""],
        ["Effective sample size of the weights", convergenceFigure(Math.round(d.essMin)), ""],
        ["Likelihood evaluations (a gradient counted at its cost)", String(d.likelihoodEvaluations), ""],
        ["Wall time (s)", formatSignificant(d.seconds, 3), ""],
      ]
    : [
        ["Converged", d.converged ? "yes" : "no", d.converged ? "" : "bad"],
        [
          "Largest rank-normalised split R-hat",
          convergenceFigure(d.rhatMax),
          (d.rhatMax ?? NaN) < (d.rhatThreshold ?? RHAT_THRESHOLD) ? "" : "bad",
        ],
        ["R-hat bound for this number of chains", formatSignificant(d.rhatThreshold ?? RHAT_THRESHOLD, 4), ""],
        ["Smallest effective sample size", convergenceFigure(Math.round(d.essMin)), ""],
        ["Largest integrated autocorrelation time (steps)", convergenceFigure(d.autocorrelationTime, 3), ""],
        ["Mean acceptance rate", formatSignificant(d.acceptance ?? NaN, 3), ""],
        ["Likelihood evaluations (a gradient counted at its cost)", String(d.likelihoodEvaluations), ""],
        ["Wall time (s)", formatSignificant(d.seconds, 3), ""],
      ];
  const listed = new Set(["converged", "rhatMax", "rhatThreshold", "essMin", "autocorrelationTime", "acceptance", "likelihoodEvaluations", "seconds", "method", "paretoK", "paretoKThreshold"]);
  for (const [key, value] of Object.entries(d)) {
    if (listed.has(key)) continue;
    const label = DIAGNOSTIC_LABELS[key] ?? keyInWords(key);
    if (typeof value === "number") known.push([label, key === "keptDraws" ? String(value) : formatSignificant(value, 4), ""]);
    else if (typeof value === "string") known.push([label, DIAGNOSTIC_WORDS[key]?.[value] ?? value, value === "budget" ? "bad" : ""]);
    else if (typeof value === "boolean") known.push([label, value ? "yes" : "no", ""]);
  }
  const rows = known.map(
    ([label, value, cls]) =>
      `<tr${cls ? ` class="${cls}"` : ""}><th scope="row">${escapeHtml(label)}</th><td>${escapeHtml(value)}</td></tr>`,
  );
  const note = importance
    ? `An importance sample is trusted when the Pareto k-hat of its weights is at most the threshold for its number of draws and the weights' effective sample size is at least 400 (Vehtari et al. 2024); its draws are independent, so R-hat and autocorrelation do not apply.`
    : `Chains are taken as mixed when R-hat is below ${RHAT_THRESHOLD} for four chains (Vehtari et al. 2021), and below the bound that asks the same effective sample size for more chains, such as the walkers of an ensemble.`;
  return `<table class="numbers narrow"><tbody>\n${rows.join("\n")}\n</tbody></table>
<p class="note">${note}</p>`;
}

function dataTable(input: ReportInput): string {
  const { result, lightCurve } = input;
  const timeUnit = timeUnitOf(input);
  const rows: [string, string][] = [
    ["Source", lightCurve.provenance.source],
    ["Measurements", String(result.data.n)],
    ["Rows dropped (missing values and placeholder codes)", String(result.data.dropped)],
    ...(result.data.placeholders ? ([["Of these, placeholder codes (99, 99.99, -99, -999)", String(result.data.placeholders)]] as [string, string][]) : []),
    ["Rows sorted by time on reading", lightCurve.provenance.sorted ? "yes (the file was not in time order)" : "no (already in time order)"],
    ["Baseline", `${formatSignificant(result.data.baseline, 4)} ${timeUnit}`],
    ["Median cadence", `${formatSignificant(result.data.medianCadence, 3)} ${timeUnit}`],
    ["Columns (time, value, error)", `${result.data.timeColumn}, ${result.data.valueColumn}, ${result.data.errorColumn ?? "none"}`],
    ["Values", lightCurve.unit === "mag" ? "magnitudes" : "fluxes"],
    ...(lightCurve.band === undefined ? [] : ([["Band", lightCurve.band]] as [string, string][])),
  ];
  return `<table class="numbers narrow"><tbody>\n${rows
    .map(([k, v]) => `<tr><th scope="row">${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`)
    .join("\n")}\n</tbody></table>`;
}

const STYLE = `
:root { color-scheme: light; }
body { margin: 0; background: #f6f6f4; color: #1a1a1a; font: 15px/1.5 "DejaVu Sans", Verdana, sans-serif; }
main { max-width: 900px; margin: 0 auto; padding: 24px 20px 48px; background: #ffffff; }
h1 { font-size: 1.45em; margin: 0 0 4px; }
h2 { font-size: 1.1em; margin: 28px 0 8px; }
.meta { color: #555555; margin: 0; font-size: 0.9em; }
code { font-family: "DejaVu Sans Mono", monospace; font-size: 0.92em; }
.warnings { margin: 20px 0; padding: 12px 16px; border: 2px solid #b5470b; border-left-width: 8px; background: #fff4e5; }
.warnings h2 { margin: 0 0 6px; color: #8a3200; }
.warnings ul { margin: 0; padding-left: 20px; }
.warnings.none { border-color: #6a9a6a; background: #f0f7f0; }
.warnings.none h2 { color: #2f5f2f; }
.warnings.none p { margin: 0; }
figure { margin: 28px 0 0; }
.figure-body { overflow-x: auto; }
figure svg { display: block; max-width: 100%; height: auto; }
figcaption { font-size: 0.9em; color: #333333; margin-top: 6px; }
.files { color: #666666; }
table.numbers { border-collapse: collapse; font-size: 0.9em; width: 100%; }
table.numbers.narrow { width: auto; }
table.numbers th, table.numbers td { border-bottom: 1px solid #dddddd; padding: 4px 10px 4px 0; text-align: left; vertical-align: top; }
table.numbers thead th { border-bottom: 2px solid #999999; }
table.numbers td { font-variant-numeric: tabular-nums; }
tr.bad td, tr.bad th { color: #a01010; font-weight: bold; }
.name { color: #777777; font-weight: normal; font-size: 0.85em; }
.note { font-size: 0.85em; color: #555555; }
footer { margin-top: 36px; font-size: 0.85em; color: #666666; }
`;
