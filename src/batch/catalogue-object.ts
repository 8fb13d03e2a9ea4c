import type { LightCurve } from "../lightcurve/light-curve.js";

/**
 * One object of a catalogue as the batch runner receives it: its id and its light curve, or, when the
 * light curve could not be read, the reason (the object is then recorded as failed).
 */
export interface CatalogueObject {
  readonly id: string;
  readonly lightCurve?: LightCurve;
  /**
   * An object observed in several bands (no `--band` chosen): every band's light curve, fitted by the
   * multi-band rule (`fitBands` in models/fit-band-set.ts; `lightCurve` is then absent).
   */
  readonly bands?: readonly LightCurve[];
  /** Why there is no light curve (for example an input error naming the file, line and column). */
  readonly problem?: string;
  /** What the reader had to tell about the data (dropped rows, an assumed unit); added to the row's warnings. */
  readonly warnings?: readonly string[];
}
