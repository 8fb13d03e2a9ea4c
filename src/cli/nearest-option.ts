/**
 * The known option closest to a mistyped one, by edit distance (Levenshtein 1966: insertions, deletions
 * and substitutions, plus swaps of two neighbouring letters, Damerau 1964), or undefined when none is
 * close: at most 2 edits, and fewer than half the letters of the typed name.
 *
 * @example nearestOption("redshfit", ["redshift", "robust", "seed"]) // "redshift"
 */
export function nearestOption(typed: string, known: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const name of known) {
    const distance = editDistance(typed.toLowerCase(), name.toLowerCase());
    if (distance < bestDistance) (best = name), (bestDistance = distance);
  }
  return bestDistance <= 2 && bestDistance < typed.length / 2 ? best : undefined;
}

/** Optimal-string-alignment distance between two short strings. */
function editDistance(a: string, b: string): number {
  const rows = a.length + 1;
  const columns = b.length + 1;
  const d: number[] = new Array<number>(rows * columns).fill(0);
  for (let i = 0; i < rows; i++) d[i * columns] = i;
  for (let j = 0; j < columns; j++) d[j] = j;
  for (let i = 1; i < rows; i++) {
    for (let j = 1; j < columns; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let value = Math.min(d[(i - 1) * columns + j] + 1, d[i * columns + j - 1] + 1, d[(i - 1) * columns + j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) value = Math.min(value, d[(i - 2) * columns + j - 2] + 1);
      d[i * columns + j] = value;
    }
  }
  return d[rows * columns - 1];
}
