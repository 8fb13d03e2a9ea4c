import type { TopLevelSpec } from "vega-lite";

/** A figure of the report before rendering: a Vega-Lite specification and the words around it. */
export interface ReportFigure {
  /** A file-name-safe identifier, for example "light-curve"; the figure files are `<id>.svg` and `<id>.png`. */
  readonly id: string;
  /** A short heading. */
  readonly title: string;
  /** One or two sentences saying what is drawn, for the report and for a referee. */
  readonly caption: string;
  readonly spec: TopLevelSpec;
}
