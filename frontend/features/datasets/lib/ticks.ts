/** Round tick values (1, 2 or 5 × 10^k apart) covering [lo, hi], about `count` of them. */
export function niceTicks(lo: number, hi: number, count = 7): number[] {
  const span = hi - lo;
  if (!(span > 0) || !Number.isFinite(span)) return [lo];
  const raw = span / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  const step = (f >= 7.5 ? 10 : f >= 3.5 ? 5 : f >= 1.5 ? 2 : 1) * mag;
  // ticks as whole multiples of the step, rounded to its decimals, so zero is 0 and not 1e-17
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(step)));
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + span * 1e-9; k++) out.push(Number((k * step).toFixed(decimals)) || 0);
  return out;
}
