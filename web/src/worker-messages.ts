/**
 * The messages between the page and its fit worker. Everything is plain data (structured clone):
 * the page sends the file's bytes and the form's choices, the worker answers with progress, a
 * question about columns, an error line or the finished fit.
 */
import type { ModelName as FamilyModelName } from "../../src/kernels/families.js";

/** Column names the user chose in the page when the file's names were not recognised. */
export interface ColumnAnswer {
  readonly timeColumn: string;
  readonly valueColumn: string;
  /** An error column, or null for none. */
  readonly errorColumn: string | null;
}

/** Page -> worker: fit this file. */
export interface FitRequest {
  readonly type: "fit";
  readonly fileName: string;
  readonly bytes: ArrayBuffer;
  /** A model of the trade the page offers (a kernel family's model, src/kernels/families.ts). */
  readonly model: FamilyModelName;
  readonly background: boolean;
  readonly robust: boolean;
  readonly seed: number;
  readonly maxEvaluations: number;
  readonly redshift?: number;
  readonly columns?: ColumnAnswer;
  /**
   * A file with several bands: "joint" fits one process seen in every band (amplitude and mean per band,
   * with `lags` a lag per band relative to `referenceBand`, default the best-sampled band); "one" fits
   * the band named `band` (default the first) on its own.
   */
  readonly bands: "joint" | "one";
  readonly band?: string;
  readonly lags: boolean;
  readonly referenceBand?: string;
}

/** Worker -> page: how far the sampler is. */
export interface ProgressMessage {
  readonly type: "progress";
  readonly stage: string;
  /** Fraction of the run done, in [0, 1]. */
  readonly fraction: number;
  readonly evaluations: number;
  /** The latest convergence check, if one was made. */
  readonly rhatMax?: number;
  readonly rhatThreshold?: number;
  readonly converged?: boolean;
}

/** Worker -> page: the file's time or value column has no recognised name; ask which is which. */
export interface ColumnQuestion {
  readonly type: "columns";
  readonly message: string;
  readonly columns: readonly string[];
}

/** Worker -> page: a one-line error (a reading error names the file, line and column). */
export interface ErrorMessage {
  readonly type: "error";
  readonly message: string;
}

/** Worker -> page: the fit is done. */
export interface FitDone {
  readonly type: "done";
  /** The fit-result JSON, as `horologium fit --out` writes it. */
  readonly resultJson: string;
  /** The posterior-predictive curve as `horologium predict` writes it. */
  readonly predictionsCsv: string;
  /** The self-contained HTML report. */
  readonly reportHtml: string;
  /** File names for the downloads: `<stem>-<model>`. */
  readonly downloadStem: string;
  readonly seconds: number;
}

export type WorkerMessage = ProgressMessage | ColumnQuestion | ErrorMessage | FitDone;
