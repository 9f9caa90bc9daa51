/**
 * Statistics of one measured column: summary, a normality test, capability against the
 * tolerance it maps to, outliers, and a histogram with the fitted normal curve.
 * Pure functions over plain arrays; the server runs them, tests check them against jstat
 * and published values.
 *
 * Choices, each named where it is used:
 * - standard deviation with n − 1; quartiles by linear interpolation between order
 *   statistics (rank p·(n − 1), "type 7").
 * - normality: Anderson–Darling with mean and σ estimated from the sample, the statistic
 *   modified for sample size as A* = A²·(1 + 0.75/n + 2.25/n²) and its p-value from the
 *   four-piece approximation of D'Agostino & Stephens (1986, Goodness-of-Fit Techniques,
 *   Table 4.9). Needs n ≥ 8.
 * - capability: every unit in one group (no rational subgroups in a first build), so σ is
 *   the overall sample σ and Cp, Cpk here are what subgrouped studies call Pp, Ppk.
 * - outliers: modified z-score M = 0.6745·(x − median) / MAD, flagged when |M| > 3.5
 *   (Iglewicz & Hoaglin, 1993). With MAD = 0 (over half the values equal) the mean absolute
 *   deviation stands in, as M = (x − median) / (1.253314·meanAD).
 */

export type Summary = { n: number; mean: number; std: number; min: number; max: number; median: number; q1: number; q3: number };

/** Quantile by linear interpolation at rank p·(n − 1) of sorted values. */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = p * (n - 1);
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort();
}

export function summarize(values: ArrayLike<number>): Summary {
  const n = values.length;
  if (n === 0) return { n: 0, mean: NaN, std: NaN, min: NaN, max: NaN, median: NaN, q1: NaN, q3: NaN };
  // Welford: one pass, no cancellation for values with a large offset (absolute heights).
  let mean = 0,
    m2 = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i] - mean;
    mean += d / (i + 1);
    m2 += d * (values[i] - mean);
  }
  const s = sortedCopy(values);
  return {
    n,
    mean,
    std: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0,
    min: s[0],
    max: s[n - 1],
    median: quantileSorted(s, 0.5),
    q1: quantileSorted(s, 0.25),
    q3: quantileSorted(s, 0.75),
  };
}

/**
 * Lower-tail standard normal probability Φ(x) with its relative accuracy kept in the tails
 * (better than 2e-8 down to x = −7.5, checked against SciPy): Hart's rational approximation
 * (1968) as laid out by G. West (2005, "Better approximations to cumulative normal
 * functions"), a continued fraction beyond |x| = 7.07. The normality test takes logarithms
 * of both tails, where 1 − Φ computed by subtraction would lose every digit.
 */
export function normalCdf(x: number): number {
  const a = Math.abs(x);
  if (a > 37) return x > 0 ? 1 : 0;
  const e = Math.exp((-a * a) / 2);
  let c: number;
  if (a < 7.07106781186547) {
    let num = 3.52624965998911e-2 * a + 0.700383064443688;
    num = num * a + 6.37396220353165;
    num = num * a + 33.912866078383;
    num = num * a + 112.079291497871;
    num = num * a + 221.213596169931;
    num = num * a + 220.206867912376;
    let den = 8.83883476483184e-2 * a + 1.75566716318264;
    den = den * a + 16.064177579207;
    den = den * a + 86.7807322029461;
    den = den * a + 296.564248779674;
    den = den * a + 637.333633378831;
    den = den * a + 793.826512519948;
    den = den * a + 440.413735824752;
    c = (e * num) / den;
  } else {
    let b = a + 0.65;
    b = a + 4 / b;
    b = a + 3 / b;
    b = a + 2 / b;
    b = a + 1 / b;
    c = e / b / 2.506628274631;
  }
  return x > 0 ? 1 - c : c;
}

export function normalPdf(x: number, mean = 0, std = 1): number {
  const z = (x - mean) / std;
  return Math.exp(-0.5 * z * z) / (std * Math.sqrt(2 * Math.PI));
}

export const AD_MIN_N = 8;

export type AndersonDarling = {
  method: "anderson-darling";
  /** A², parameters estimated from the sample */
  a2: number;
  /** A* = A²·(1 + 0.75/n + 2.25/n²) */
  a2Star: number;
  pValue: number;
  /** p ≥ 0.05: no evidence against a normal distribution at the 5 % level */
  normalAt5pct: boolean;
};

/** p-value of the modified statistic A* (D'Agostino & Stephens 1986, Table 4.9). */
export function adPValue(a: number): number {
  let p: number;
  if (a < 0.2) p = 1 - Math.exp(-13.436 + 101.14 * a - 223.73 * a * a);
  else if (a < 0.34) p = 1 - Math.exp(-8.318 + 42.796 * a - 59.938 * a * a);
  else if (a < 0.6) p = Math.exp(0.9177 - 4.279 * a - 1.38 * a * a);
  // Past 10 the parabola turns up again; the true p is far below anything shown.
  else if (a < 10) p = Math.exp(1.2937 - 5.709 * a + 0.0186 * a * a);
  else p = 3.7e-24;
  return Math.min(1, Math.max(0, p));
}

export function andersonDarling(values: ArrayLike<number>): AndersonDarling | null {
  const n = values.length;
  if (n < AD_MIN_N) return null;
  const { mean, std } = summarize(values);
  if (!(std > 0)) return null;
  const s = sortedCopy(values);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    // ln Φ(z_i) + ln(1 − Φ(z_{n+1−i})), the second as ln Φ(−z) to keep the upper tail exact
    const lo = normalCdf((s[i] - mean) / std);
    const hi = normalCdf(-(s[n - 1 - i] - mean) / std);
    sum += (2 * i + 1) * (Math.log(lo) + Math.log(hi));
  }
  const a2 = -n - sum / n;
  const a2Star = a2 * (1 + 0.75 / n + 2.25 / (n * n));
  const pValue = adPValue(a2Star);
  return { method: "anderson-darling", a2, a2Star, pValue, normalAt5pct: pValue >= 0.05 };
}

export type Capability = {
  lsl: number;
  usl: number;
  cp: number;
  cpk: number;
  /** fraction outside the limits of the fitted normal, in ppm */
  expectedPpm: number;
  /** measured values outside the limits */
  observedOut: number;
  observedPpm: number;
};

export function capability(values: ArrayLike<number>, lsl: number, usl: number, fit?: { mean: number; std: number }): Capability | null {
  const { mean, std, n } = fit ? { ...fit, n: values.length } : summarize(values);
  if (!(std > 0) || !(usl > lsl) || n < 2) return null;
  let out = 0;
  for (let i = 0; i < values.length; i++) if (values[i] < lsl || values[i] > usl) out++;
  return {
    lsl,
    usl,
    cp: (usl - lsl) / (6 * std),
    cpk: Math.min(usl - mean, mean - lsl) / (3 * std),
    expectedPpm: 1e6 * (normalCdf((lsl - mean) / std) + normalCdf(-(usl - mean) / std)),
    observedOut: out,
    observedPpm: (1e6 * out) / values.length,
  };
}

export type Outlier = { index: number; value: number; score: number };
export const OUTLIER_LIMIT = 3.5;

/** Values whose modified z-score exceeds 3.5 in magnitude (see the header). */
export function outliers(values: ArrayLike<number>): Outlier[] {
  const n = values.length;
  if (n < 3) return [];
  const s = sortedCopy(values);
  const med = quantileSorted(s, 0.5);
  const dev = new Float64Array(n);
  for (let i = 0; i < n; i++) dev[i] = Math.abs(values[i] - med);
  const mad = quantileSorted(sortedCopy(dev), 0.5);
  let scale: number;
  if (mad > 0) scale = mad / 0.6745;
  else {
    let meanAd = 0;
    for (let i = 0; i < n; i++) meanAd += dev[i];
    meanAd /= n;
    if (!(meanAd > 0)) return [];
    scale = 1.253314 * meanAd;
  }
  const out: Outlier[] = [];
  for (let i = 0; i < n; i++) {
    const score = (values[i] - med) / scale;
    if (Math.abs(score) > OUTLIER_LIMIT) out.push({ index: i, value: values[i], score });
  }
  return out;
}

export type Histogram = {
  /** equal-width bins over the measured range: [from, to), the last one closed */
  bins: { from: number; to: number; count: number }[];
  /** the fitted normal scaled to counts per bin, over the plotted range */
  curve: { x: number; y: number }[];
  domain: [number, number];
};

/**
 * Bins by the Freedman–Diaconis width 2·IQR·n^(−1/3) (Sturges' count when the IQR is zero),
 * kept between 5 and 40 bins; the plotted range also reaches the tolerance limits.
 */
export function histogram(values: ArrayLike<number>, limits?: { lsl: number; usl: number } | null, curvePoints = 81): Histogram {
  const n = values.length;
  const s = sortedCopy(values);
  const { mean, std } = summarize(values);
  const lo = s[0],
    hi = s[n - 1];
  const range = hi - lo;
  let k: number;
  if (!(range > 0)) k = 1;
  else {
    const iqr = quantileSorted(s, 0.75) - quantileSorted(s, 0.25);
    k = iqr > 0 ? Math.ceil(range / (2 * iqr * Math.cbrt(n))) : Math.ceil(Math.log2(n) + 1);
    k = Math.max(5, Math.min(40, k));
  }
  const w = range > 0 ? range / k : Math.max(Math.abs(lo) * 0.01, 1e-9);
  const start = range > 0 ? lo : lo - w / 2;
  const bins = Array.from({ length: k }, (_, i) => ({ from: start + i * w, to: start + (i + 1) * w, count: 0 }));
  for (let i = 0; i < n; i++) {
    const b = Math.min(k - 1, Math.max(0, Math.floor((s[i] - start) / w)));
    bins[b].count++;
  }
  let dLo = start,
    dHi = start + k * w;
  if (limits) {
    dLo = Math.min(dLo, limits.lsl);
    dHi = Math.max(dHi, limits.usl);
  }
  if (std > 0) {
    dLo = Math.min(dLo, mean - 3.5 * std);
    dHi = Math.max(dHi, mean + 3.5 * std);
  }
  const pad = (dHi - dLo) * 0.04;
  const domain: [number, number] = [dLo - pad, dHi + pad];
  const curve: { x: number; y: number }[] = [];
  if (std > 0) {
    for (let i = 0; i < curvePoints; i++) {
      const x = domain[0] + ((domain[1] - domain[0]) * i) / (curvePoints - 1);
      curve.push({ x, y: n * w * normalPdf(x, mean, std) });
    }
  }
  return { bins, curve, domain };
}
