/**
 * The file name without folders and extensions (`data/lds-quasar.csv.gz` -> `lds-quasar`), as the object's
 * name in a report's title when nothing better is known; the source itself when that leaves nothing.
 */
export function sourceStem(source: string): string {
  return source.replace(/^.*[\\/]/, "").replace(/\.gz$/i, "").replace(/\.[^.]+$/, "") || source;
}
