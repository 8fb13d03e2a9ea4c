/** Composite Simpson rule on [a, b] with an even number of intervals (Press et al., Numerical Recipes, 3rd ed., eq. 4.1.13). */
export function simpsonRule(f: (x: number) => number, a: number, b: number, intervals: number): number {
  const n = intervals + (intervals % 2);
  const h = (b - a) / n;
  let total = f(a) + f(b);
  for (let i = 1; i < n; i++) total += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (total * h) / 3;
}
