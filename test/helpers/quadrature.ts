/** Composite Simpson rule for f on [a, b] with an even number of intervals (test reference). */
export function simpson(f: (x: number) => number, a: number, b: number, intervals: number): number {
  const n = intervals % 2 === 0 ? intervals : intervals + 1;
  const h = (b - a) / n;
  let total = f(a) + f(b);
  for (let i = 1; i < n; i++) total += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (total * h) / 3;
}
