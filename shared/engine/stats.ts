/** Interval estimates used in reports. */
import { normInv } from "./distributions";

export const Z95 = normInv(0.975);

/**
 * Wilson score interval for a binomial proportion k/n (95 % by default). Chosen over the
 * Wald interval because it stays inside [0, 1] and keeps its coverage when the yield is
 * close to 1 (few failures), which is where yield targets such as 0.9973 live.
 */
export function wilson(k: number, n: number, z = Z95): [number, number] {
  if (n <= 0) return [0, 1];
  const p = k / n;
  const z2 = z * z;
  const den = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / den;
  const half = (z / den) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return [k <= 0 ? 0 : Math.max(0, centre - half), k >= n ? 1 : Math.min(1, centre + half)];
}

/** Sample standard deviation (n − 1) from Welford sums. */
export function sampleStd(m2: number, n: number): number {
  return n > 1 ? Math.sqrt(m2 / (n - 1)) : 0;
}
