import { createRng } from "../../src/random/rng.js";
import type { CatalogueObject } from "../../src/batch/catalogue-object.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";

/**
 * Invented light curves of the made-up "Lanternfield" survey for the batch tests: object `lf-NNN` has
 * `points` noisy magnitudes around 19 + NNN/100. Sentinel ids get a sentinel first value understood by
 * fixtures/summary-fit.mjs: `failing` ids -111, `crashing` ids -777, `hanging` ids -555, `hoarding` ids -333.
 */
export function inventedLightCurve(id: string, points: number, firstValue?: number): LightCurve {
  const rng = createRng(`lanternfield/${id}`);
  const time = new Float64Array(points);
  const value = new Float64Array(points);
  const error = new Float64Array(points);
  const level = 19 + Number(id.replace(/\D/g, "")) / 100;
  let t = 60000;
  for (let i = 0; i < points; i++) {
    t += 1 + 3 * rng.uniform();
    time[i] = t;
    value[i] = level + 0.1 * rng.normal();
    error[i] = 0.02;
  }
  if (firstValue !== undefined) value[0] = firstValue;
  return {
    time,
    value,
    error,
    unit: "mag",
    provenance: { source: `${id}.csv`, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
  };
}

/** Sentinel roles of some ids. */
export interface Sentinels {
  readonly failing?: readonly string[];
  readonly crashing?: readonly string[];
  readonly hanging?: readonly string[];
  /** Ids whose fit allocates memory without end. */
  readonly hoarding?: readonly string[];
  /** Ids whose light curve "could not be read" (no light curve, a problem text instead). */
  readonly unreadable?: readonly string[];
}

/** The ids lf-000 ... lf-(count-1). */
export function inventedIds(count: number): string[] {
  return Array.from({ length: count }, (_, i) => `lf-${String(i).padStart(3, "0")}`);
}

/** The invented catalogue as the batch runner reads it, in the given id order. */
export async function* inventedCatalogue(ids: readonly string[], sentinels: Sentinels = {}, points = 30): AsyncGenerator<CatalogueObject> {
  for (const id of ids) {
    if (sentinels.unreadable?.includes(id)) {
      yield { id, problem: `${id}.csv:4: column "mag": 'abc' is not a number` };
      continue;
    }
    const first = sentinels.failing?.includes(id)
      ? -111
      : sentinels.crashing?.includes(id)
        ? -777
        : sentinels.hanging?.includes(id)
          ? -555
          : sentinels.hoarding?.includes(id)
            ? -333
            : undefined;
    yield { id, lightCurve: inventedLightCurve(id, points, first) };
  }
}
