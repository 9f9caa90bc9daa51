/**
 * Bounded percentile store: a signed log-bucket histogram read straight from the bits of
 * the float (the idea of HDR histograms), so that adding a value is a few integer
 * operations and no logarithm.
 *
 * Buckets: for |v| in [2^lowExp, 2^(lowExp + octaves)) each octave is cut into 2^bits
 * equal buckets; below is one "near zero" bucket, above one overflow bucket up to the
 * observed maximum. Negative values have their own mirror set, so signed and absolute
 * percentiles come from the same counts. The metrics use bits = 8 over 2^-24..2^16
 * (6e-8 to 65536 deg or %): 20,482 buckets per metric, whatever the trial count.
 *
 * Error. A bucket spans at most 2^-bits of its value (bits = 8: 0.39 %), which bounds
 * the error of a percentile even if all its values sat at one bucket edge. Read with
 * linear interpolation inside the bucket (values taken as evenly spread), what remains
 * is where the sample's points happen to lie inside that one bucket: a random error of
 * about w·sqrt(p(1−p)/k) for k = n·f·w points in a bucket of width w = q·2^-bits. The
 * Monte Carlo standard error of the percentile is sqrt(p(1−p)/n)/f(q); the ratio of the
 * two is about sqrt(q·f(q)·2^-bits), at most 1/16 for q·f(q) <= 1 (normal, Rayleigh,
 * Maxwell and such), and does not change with n, because both shrink as 1/sqrt(n). So
 * the store adds about 0.2 % to the reported sampling error. tests/engine/stats.test.ts
 * holds it to exact order statistics of 10^5 normal and Rayleigh draws (below 1/10 of
 * the standard error at p50, p95, p99 and p99.73).
 * Counts are integers: merging two stores is exact and independent of order.
 */

const BIAS = 1023;

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
const HI = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1 ? 1 : 0;

/**
 * Lower edge of every magnitude bucket, one table per bucket layout: the statistics read a
 * bucket's bounds thousands of times per metric. Bucket b (≥ 1) spans [2^e + mant·s,
 * 2^e + (mant + 1)·s) with s = 2^(e − bits); its upper edge is the next bucket's lower edge to
 * the bit (2^(e + 1) at an octave's end), so one table gives both; bucket 0 is [0, 2^lowExp),
 * the top one [2^(lowExp + octaves), observed maximum].
 */
const lowerEdges = new Map<string, Float64Array>();
function lowerEdgesOf(bits: number, lowExp: number, octaves: number, perSign: number): Float64Array {
  const key = `${bits},${lowExp},${octaves}`;
  let t = lowerEdges.get(key);
  if (!t) {
    t = new Float64Array(perSign);
    t[0] = 0;
    for (let b = 1; b < perSign - 1; b++) {
      const k = b - 1;
      const e = (k >> bits) + lowExp;
      const mant = k & ((1 << bits) - 1);
      const scale = 2 ** e / (1 << bits);
      t[b] = 2 ** e + mant * scale;
    }
    t[perSign - 1] = 2 ** (lowExp + octaves);
    lowerEdges.set(key, t);
  }
  return t;
}

export class LogHistogram {
  readonly bits: number;
  readonly lowExp: number;
  readonly octaves: number;
  /** buckets per sign: near-zero, OCTAVES·2^bits, overflow */
  readonly perSign: number;
  readonly counts: Uint32Array;
  private readonly shift: number;
  private readonly base: number;
  /** lower edge of each magnitude bucket (lowerEdgesOf) */
  private readonly lower: Float64Array;
  /** occupied()'s answer while the counts stay as they are (add and merge forget it) */
  private range: [number, number] | null = null;

  /** buckets of 2^-bits per octave for |v| in [2^lowExp, 2^(lowExp + octaves)) */
  constructor(bits: number, lowExp: number, octaves: number, counts?: Uint32Array) {
    this.bits = bits;
    this.lowExp = lowExp;
    this.octaves = octaves;
    this.perSign = octaves * (1 << bits) + 2;
    this.counts = counts ?? new Uint32Array(2 * this.perSign);
    this.shift = 20 - bits;
    this.base = (BIAS + lowExp) << bits;
    this.lower = lowerEdgesOf(bits, lowExp, octaves, this.perSign);
  }

  /** Upper edge of magnitude bucket b (lower edge: this.lower[b]): the next one's lower edge, or the observed maximum above the top. */
  private upper(b: number, maxAbs: number): number {
    return b === this.perSign - 1 ? Math.max(maxAbs, this.lower[b]) : this.lower[b + 1];
  }

  /** Bucket index of v: [0, perSign) for v >= 0, [perSign, 2·perSign) for v < 0. */
  index(v: number): number {
    f64[0] = v;
    const hi = u32[HI];
    const neg = hi >>> 31;
    const key = (hi & 0x7fffffff) >>> this.shift;
    let b = key - this.base + 1;
    if (b < 1) b = 0;
    else if (b > this.perSign - 2) b = this.perSign - 1;
    return neg ? this.perSign + b : b;
  }

  add(v: number): void {
    this.counts[this.index(v)]++;
    this.range = null;
  }

  merge(o: LogHistogram): void {
    const c = this.counts,
      d = o.counts;
    for (let i = 0; i < c.length; i++) c[i] += d[i];
    this.range = null;
  }

  /**
   * First and last magnitude bucket holding any value (either sign), [0, −1] when empty:
   * the scans below visit only these (a metric fills a few octaves of the forty). Found once
   * and kept until the counts change, or taken from the extremes (knownExtremes).
   */
  occupied(): [number, number] {
    return (this.range ??= this.scanOccupied());
  }

  /**
   * The occupied buckets from the smallest and largest |v| counted, without a scan: exact
   * when every value counted other than NaN has minAbs <= |v| <= maxAbs (a NaN counts in the
   * overflow bucket, which is looked at), as the engine's stores keep them. Returns this.
   */
  knownExtremes(minAbs: number, maxAbs: number): this {
    this.range = this.rangeOfExtremes(minAbs, maxAbs);
    return this;
  }

  /** occupied() of the counts as knownExtremes describes them. */
  private rangeOfExtremes(minAbs: number, maxAbs: number): [number, number] {
    const P = this.perSign;
    const nan = this.counts[P - 1] !== 0 || this.counts[2 * P - 1] !== 0;
    if (!(minAbs <= maxAbs)) return nan ? [P - 1, P - 1] : [0, -1];
    return [this.index(minAbs), nan ? P - 1 : this.index(maxAbs)];
  }

  private scanOccupied(): [number, number] {
    const P = this.perSign;
    const c = this.counts;
    let first = 0,
      last = P - 1;
    while (first < P && c[first] === 0 && c[P + first] === 0) first++;
    if (first === P) return [0, -1];
    while (c[last] === 0 && c[P + last] === 0) last--;
    return [first, last];
  }

  total(): number {
    let n = 0;
    for (let i = 0; i < this.counts.length; i++) n += this.counts[i];
    return n;
  }

  /**
   * Percentile of |v| (q in [0, 1]) with the convention of linear interpolation between
   * order statistics at rank q·(n − 1); values inside a bucket are taken as evenly
   * spread; the result is clamped to the observed [minAbs, maxAbs].
   */
  quantileAbs(q: number, minAbs: number, maxAbs: number): number {
    return this.quantilesAbs([q], minAbs, maxAbs)[0];
  }

  /** Several |v| percentiles (as quantileAbs), from one pass over the buckets. */
  quantilesAbs(qs: number[], minAbs: number, maxAbs: number): number[] {
    return this.quantiles(qs, minAbs, maxAbs, false, maxAbs);
  }

  /** Signed percentile, clamped to the observed [min, max]. */
  quantileSigned(q: number, min: number, max: number): number {
    return this.quantilesSigned([q], min, max)[0];
  }

  /** Several signed percentiles (as quantileSigned), from one pass over the buckets. */
  quantilesSigned(qs: number[], min: number, max: number): number[] {
    return this.quantiles(qs, min, max, true, Math.max(Math.abs(min), Math.abs(max)));
  }

  /**
   * Percentiles q (rank q·(n − 1), linear between neighbouring order statistics), the extreme
   * order statistics taken exactly from lowest and highest, clamped to them; signed in value
   * order, else of |v|. The ranks are looked up in one walk over the buckets (orderValues).
   */
  private quantiles(qs: number[], lowest: number, highest: number, signed: boolean, maxAbs: number): number[] {
    const n = this.occupiedTotal();
    if (n === 0) return qs.map(() => NaN);
    // the order statistics each q needs (rank lo, and hi when between two), looked up together
    const ranks: number[] = [];
    for (const q of qs) {
      const r = q * (n - 1);
      const lo = Math.floor(r);
      ranks.push(lo, Math.min(n - 1, lo + 1));
    }
    const inner = ranks.filter((idx) => idx > 0 && idx < n - 1);
    const found = this.orderValues(inner, signed, maxAbs);
    const at = (idx: number): number => {
      if (idx >= n - 1) return highest;
      if (idx <= 0) return lowest;
      return found.get(idx) as number;
    };
    return qs.map((q, i) => {
      const r = q * (n - 1);
      const lo = ranks[2 * i],
        hi = ranks[2 * i + 1],
        frac = r - lo;
      const v = frac === 0 ? at(lo) : at(lo) + frac * (at(hi) - at(lo));
      return Math.min(highest, Math.max(lowest, v));
    });
  }

  /** Number of values counted in the occupied buckets (all of them). */
  private occupiedTotal(): number {
    const P = this.perSign;
    const c = this.counts;
    const [first, last] = this.occupied();
    let n = 0;
    for (let b = first; b <= last; b++) n += c[b] + c[P + b];
    return n;
  }

  /**
   * The order statistics of the given ranks (0 < idx < n − 1), in one walk over the occupied
   * buckets in value order (signed: the negative side from the largest magnitude down, then
   * the positive one; else by magnitude, both signs together): the value of rank idx lies in
   * the first bucket whose count reaches past it, its values taken as evenly spread there.
   * Counts are integers below 2^53: the running sums are exact.
   */
  private orderValues(ranks: number[], signed: boolean, maxAbs: number): Map<number, number> {
    const P = this.perSign;
    const c = this.counts;
    const [first, last] = this.occupied();
    const sorted = [...new Set(ranks)].sort((x, y) => x - y);
    const out = new Map<number, number>();
    let next = 0,
      before = 0;
    const visit = (b: number, k: number, negative: boolean) => {
      while (next < sorted.length && sorted[next] < before + k) {
        const idx = sorted[next++];
        const l = this.lower[b],
          u = this.upper(b, maxAbs);
        out.set(idx, negative ? -(u - ((idx - before + 0.5) / k) * (u - l)) : l + ((idx - before + 0.5) / k) * (u - l));
      }
      before += k;
    };
    if (signed) {
      for (let b = last; b >= first && next < sorted.length; b--) if (c[P + b]) visit(b, c[P + b], true);
      for (let b = first; b <= last && next < sorted.length; b++) if (c[b]) visit(b, c[b], false);
    } else {
      for (let b = first; b <= last && next < sorted.length; b++) if (c[b] + c[P + b]) visit(b, c[b] + c[P + b], false);
    }
    return out;
  }

  /**
   * Shortest interval [lo, hi] of signed values holding a fraction p of the sample (the
   * shortest coverage interval of JCGM 101 5.3.4, for skewed outputs such as tilt
   * magnitudes), searched over 200 lower ends between the 0 and (1 − p) quantiles.
   */
  shortestInterval(p: number, min: number, max: number): [number, number] {
    const P = this.perSign;
    const c = this.counts;
    const maxAbs = Math.max(Math.abs(min), Math.abs(max));
    const [first, last] = this.occupied();
    const n = this.occupiedTotal();
    if (n === 0) return [NaN, NaN];
    // the buckets in value order, position t: the negative side (t < W) from the largest
    // magnitude down, then the positive one; [lo, hi) its bounds, k its count
    const W = last - first + 1;
    const count = (t: number) => (t < W ? c[P + last - t] : c[first + t - W]);
    // the value of rank q·(n − 1), for q that only grow: the bucket holding it (the first whose
    // count reaches past the rank) is found by walking on from the last one, not by a search
    const cursor = () => {
      let t = 0,
        before = 0,
        k = count(0);
      return (q: number): number => {
        const idx = q * (n - 1);
        if (idx <= 0) return min;
        if (idx >= n - 1) return max;
        while (before + k <= idx) {
          before += k;
          k = count(++t);
        }
        const b = t < W ? last - t : first + t - W;
        const lo = t < W ? -this.upper(b, maxAbs) : this.lower[b],
          hi = t < W ? -this.lower[b] : this.upper(b, maxAbs);
        const v = lo + ((idx - before + 0.5) / k) * (hi - lo);
        return Math.min(max, Math.max(min, v));
      };
    };
    const atLow = cursor(),
      atHigh = cursor();
    let best: [number, number] = [atLow(0), atHigh(p)];
    const steps = 200;
    for (let i = 1; i <= steps; i++) {
      const q = ((1 - p) * i) / steps;
      const l = atLow(q),
        u = atHigh(q + p);
      if (u - l < best[1] - best[0]) best = [l, u];
    }
    return best;
  }

  /** Count of values with |v| <= limit (buckets straddling the limit are split evenly). */
  countAbsAtMost(limit: number, maxAbs: number): number {
    const P = this.perSign;
    let n = 0;
    const [first, last] = this.occupied();
    for (let b = first; b <= last; b++) {
      const k = this.counts[b] + this.counts[P + b];
      if (k === 0) continue;
      const l = this.lower[b],
        u = this.upper(b, maxAbs);
      if (u <= limit) n += k;
      else if (l < limit) n += (k * (limit - l)) / (u - l);
    }
    return n;
  }

  /**
   * Equal-width histogram for plots over [lo, hi] (signed values, or |v| when abs):
   * each bucket's count goes to the plot bin that holds its midpoint.
   */
  plotBins(lo: number, hi: number, nBins: number, abs: boolean): { edges: number[]; counts: number[] } {
    const P = this.perSign;
    const counts = new Array<number>(nBins).fill(0);
    const width = hi > lo ? (hi - lo) / nBins : 1;
    const maxAbs = Math.max(Math.abs(lo), Math.abs(hi));
    const put = (v: number, k: number) => {
      let i = Math.floor((v - lo) / width);
      if (i < 0) i = 0;
      if (i >= nBins) i = nBins - 1;
      counts[i] += k;
    };
    const [first, last] = this.occupied();
    for (let b = first; b <= last; b++) {
      const kp = this.counts[b],
        kn = this.counts[P + b];
      if (kp === 0 && kn === 0) continue;
      const l = this.lower[b],
        u = this.upper(b, maxAbs);
      const mid = 0.5 * (l + Math.min(u, maxAbs));
      if (abs) put(mid, kp + kn);
      else {
        if (kp) put(mid, kp);
        if (kn) put(-mid, kn);
      }
    }
    const edges = Array.from({ length: nBins + 1 }, (_, i) => lo + i * width);
    return { edges, counts };
  }
}
