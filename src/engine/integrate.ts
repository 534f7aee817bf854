/** Composite Simpson's rule for ∫ₐᵇ f over `intervals` (made even) equal steps. */
export function simpson(f: (x: number) => number, a: number, b: number, intervals: number): number {
  const m = intervals % 2 === 0 ? intervals : intervals + 1;
  const h = (b - a) / m;
  let sum = f(a) + f(b);
  for (let i = 1; i < m; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}
