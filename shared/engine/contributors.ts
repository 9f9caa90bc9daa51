/**
 * Which tolerance drives a metric.
 *
 * Linearised at nominal (the point where every source sits at its mean), by central
 * finite differences with step h = 10^-3·σ of each draw:
 * - signed metric m (cross-axis %): m ≈ m0 + Σ a_k (x_k − μ_k), a_k = (m⁺ − m⁻)/2h, and
 *   source s contributes Σ_{k∈s} a_k²σ_k² to Var(m) (sources are independent).
 * - magnitude m = |g(x)| (tilt, misalignment, total cross-axis, relative rotation,
 *   heading error): at nominal the derivative of a magnitude is zero or undefined, so
 *   the linear share is taken on the mean square: for g affine in x,
 *   E[m²] − m0² = Σ_k σ_k²·‖∂g/∂x_k‖², and ‖∂g/∂x_k‖² = (m⁺² + m⁻² − 2m0²)/2h² exactly.
 * - the heading metrics are built from the per-attitude errors e_k, which are signed and
 *   smooth: with J_k = ∂e_k/∂x by central differences, heading.rmsDeg splits its mean
 *   square exactly to first order, Σ_k σ²J_k²/K; heading.maxAbsDeg takes the split at the
 *   attitude whose linearised variance Σ σ²J_k² is largest (the worst attitude).
 *
 * From the Monte Carlo sample, by ordinary least squares on streamed cross-products
 * (bounded memory):
 * - signed metrics: the metric on the draws; a source's share is its part of Σ SRC²,
 *   the squared standardised regression coefficients (β_k·s_k/s_y)².
 * - magnitudes, whose linear regression on symmetric inputs is empty by symmetry: the
 *   metric squared on the squared deviations z_k = (x_k − μ_k)²; E[m²] = b0 + Σ b_k·E[z_k],
 *   so a source's share is its part of Σ b_k·mean(z_k), the same quantity the linearised
 *   split estimates. SRC² of that fit is reported beside it.
 * R² says how much of the variance the fit explains.
 */
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import type { Model } from "./compile";
import { createScratch, evaluateTrial, meanDraws } from "./trial";

export interface SourceShare {
  source: string;
  /** contribution in the metric's unit squared (variance, or mean square for magnitudes) */
  contribution: number;
  share: number;
}

export interface LinearisedResult {
  metric: string;
  basis: "variance" | "meanSquare";
  nominal: number;
  /** √Σ contributions: linearised σ (signed) or RMS increase (magnitudes) */
  total: number;
  sources: SourceShare[];
  /** per draw: central-difference slope (signed metrics) */
  slopes: Float64Array;
}

/** Linearised contributions for the metrics given by index (all at once: one sweep of the draws). */
export function linearisedContributions(m: Model, metricIdx: number[]): LinearisedResult[] {
  const x0 = meanDraws(m);
  const s = createScratch(m);
  evaluateTrial(m, x0, s);
  const m0 = Float64Array.from(metricIdx, (k) => s.metrics[k]);
  const D = m.drawCount;
  const nM = metricIdx.length;
  const nAtt = s.headingErr.length;
  const slopes = metricIdx.map(() => new Float64Array(D));
  const contrib = metricIdx.map(() => new Float64Array(m.sources.length));
  // per draw and attitude: σ²·J², for the heading metrics
  const hJ2 = new Float64Array(D * nAtt);
  const hPlus = new Float64Array(nAtt);
  const x = x0.slice();
  for (let d = 0; d < D; d++) {
    const sigma = m.drawDist[d].sigma;
    if (!(sigma > 0)) continue;
    const h = 1e-3 * sigma;
    x[d] = x0[d] + h;
    evaluateTrial(m, x, s);
    const plus = Float64Array.from(metricIdx, (k) => s.metrics[k]);
    hPlus.set(s.headingErr);
    x[d] = x0[d] - h;
    evaluateTrial(m, x, s);
    const minus = Float64Array.from(metricIdx, (k) => s.metrics[k]);
    for (let k = 0; k < nAtt; k++) {
      const j = (hPlus[k] - s.headingErr[k]) / (2 * h);
      hJ2[d * nAtt + k] = j * j * sigma * sigma;
    }
    x[d] = x0[d];
    const src = m.drawSource[d];
    for (let i = 0; i < nM; i++) {
      const a = (plus[i] - minus[i]) / (2 * h);
      slopes[i][d] = a;
      const kind = m.metrics[metricIdx[i]].kind;
      if (kind === "headingMax" || kind === "headingRms") continue;
      if (m.metrics[metricIdx[i]].signed) contrib[i][src] += a * a * sigma * sigma;
      else {
        const g2 = (plus[i] * plus[i] + minus[i] * minus[i] - 2 * m0[i] * m0[i]) / (2 * h * h);
        contrib[i][src] += Math.max(0, g2) * sigma * sigma;
      }
    }
  }
  if (nAtt > 0) {
    let worst = 0,
      worstVar = -1;
    for (let k = 0; k < nAtt; k++) {
      let v = 0;
      for (let d = 0; d < D; d++) v += hJ2[d * nAtt + k];
      if (v > worstVar) {
        worstVar = v;
        worst = k;
      }
    }
    metricIdx.forEach((mk, i) => {
      const kind = m.metrics[mk].kind;
      if (kind !== "headingMax" && kind !== "headingRms") return;
      for (let d = 0; d < D; d++) {
        let c = 0;
        if (kind === "headingMax") c = hJ2[d * nAtt + worst];
        else {
          for (let k = 0; k < nAtt; k++) c += hJ2[d * nAtt + k];
          c /= nAtt;
        }
        contrib[i][m.drawSource[d]] += c;
      }
    });
  }
  return metricIdx.map((k, i) => {
    const tot = contrib[i].reduce((a, b) => a + b, 0);
    return {
      metric: m.metrics[k].id,
      basis: m.metrics[k].signed ? "variance" : "meanSquare",
      nominal: m0[i],
      total: Math.sqrt(tot),
      sources: m.sources.map((src, j) => ({ source: src.id, contribution: contrib[i][j], share: tot > 0 ? contrib[i][j] / tot : 0 })),
      slopes: slopes[i],
    };
  });
}

export interface StackUpRow {
  metric: string;
  nominal: number;
  /** |m0| + Σ|a_k|·T_k: every tolerance at its limit in the worst direction */
  worstCase: number;
  /** |m0| + √Σ(a_k·T_k)²: root-sum-square of the tolerance limits */
  rss: number;
  /** linearised standard deviation √Σ a_k²σ_k² */
  linearStd: number;
}

/** Worst-case and RSS stack-up of the signed metrics from the linearised slopes. */
export function stackUp(m: Model, lin: LinearisedResult[]): StackUpRow[] {
  return lin
    .filter((l) => l.basis === "variance")
    .map((l) => {
      let wc = 0,
        rss = 0,
        v = 0;
      for (let d = 0; d < m.drawCount; d++) {
        const a = l.slopes[d];
        const T = m.drawDist[d].halfWidth;
        const sg = m.drawDist[d].sigma;
        wc += Math.abs(a) * T;
        rss += (a * T) ** 2;
        v += (a * sg) ** 2;
      }
      return {
        metric: l.metric,
        nominal: l.nominal,
        worstCase: Math.abs(l.nominal) + wc,
        rss: Math.abs(l.nominal) + Math.sqrt(rss),
        linearStd: Math.sqrt(v),
      };
    });
}

export interface RegressionResult {
  metric: string;
  design: "linear" | "squared";
  r2: number;
  /** share: of Σ SRC² (linear design) or of the regression's mean-square split (squared design) */
  sources: { source: string; src2: number; share: number }[];
}

/**
 * The regressors' side of a least-squares fit from streamed sums: tri = upper triangle of
 * Σ z zᵀ with z = [1, regressors]. Every metric regressed on the same design shares it, so
 * the pseudo-inverse of its covariance is made once. Null when the sample cannot support a fit.
 */
export interface RegressionDesign {
  n: number;
  mu: Float64Array;
  sd: Float64Array;
  /** cov⁺, so that β = cov⁺·cxy */
  pinv: Matrix;
}

/**
 * The pseudo-inverse that ml-matrix's solve(cov, y, true) applies to y, computed the way
 * SingularValueDecomposition.solve computes it (V·diag(1/s)·Uᵀ, singular values at or below
 * its threshold dropped, the same products in the same order), so that pinv.mmul(y) gives
 * that solve's numbers bit for bit while the decomposition is made once.
 */
function pseudoInverse(svd: SingularValueDecomposition): Matrix {
  const s = svd.diagonal;
  const e = svd.threshold;
  const Ls = Matrix.zeros(s.length, s.length);
  for (let i = 0; i < s.length; i++) Ls.set(i, i, Math.abs(s[i]) <= e ? 0 : 1 / s[i]);
  // rows as plain arrays: the triple loop runs once per study, before the JIT has warmed
  // up, where a get() call per product was most of its time
  const U = svd.leftSingularVectors.to2DArray();
  const VL = svd.rightSingularVectors.mmul(Ls).to2DArray();
  const out: number[][] = [];
  for (let i = 0; i < VL.length; i++) {
    const vl = VL[i];
    const row = new Array<number>(U.length);
    for (let j = 0; j < U.length; j++) {
      const u = U[j];
      let sum = 0;
      for (let k = 0; k < s.length; k++) sum += vl[k] * u[k];
      row[j] = sum;
    }
    out.push(row);
  }
  return new Matrix(out);
}

export function regressionDesign(cols: Int32Array, tri: Float64Array): RegressionDesign | null {
  const p = cols.length;
  const L = p + 1;
  const S = triAt(tri, L);
  const n = S(0, 0);
  if (p === 0 || n < p + 3) return null;
  const mu = new Float64Array(L);
  for (let j = 1; j < L; j++) mu[j] = S(0, j) / n;
  // plain rows, made into a Matrix once (this runs once per study, mostly before the JIT
  // has compiled it, where a set() call per entry cost more than the arithmetic)
  const cov: number[][] = Array.from({ length: p }, () => new Array<number>(p));
  const sd = new Float64Array(p);
  for (let a = 0; a < p; a++) {
    for (let b = a; b < p; b++) {
      const c = (S(a + 1, b + 1) - n * mu[a + 1] * mu[b + 1]) / (n - 1);
      cov[a][b] = c;
      cov[b][a] = c;
    }
    sd[a] = Math.sqrt(Math.max(0, cov[a][a]));
  }
  try {
    return { n, mu, sd, pinv: pseudoInverse(new SingularValueDecomposition(new Matrix(cov))) };
  } catch {
    return null;
  }
}

function triAt(tri: Float64Array, L: number): (a: number, b: number) => number {
  return (a, b) => {
    const lo = a < b ? a : b,
      hi = a < b ? b : a;
    return tri[lo * L - (lo * (lo - 1)) / 2 + (hi - lo)];
  };
}

/**
 * SRC² of one metric on a design (regressionDesign): zy = Σ z·y, yy = Σ y². Returns null
 * when the sample cannot support the fit.
 */
export function regressionFromSums(
  m: Model,
  cols: Int32Array,
  design: RegressionDesign | null,
  zy: Float64Array,
  yy: number,
  metric: string,
  kind: "linear" | "squared",
): RegressionResult | null {
  if (!design) return null;
  const p = cols.length;
  const { n, mu, sd } = design;
  const muY = zy[0] / n;
  const varY = (yy - n * muY * muY) / (n - 1);
  if (!(varY > 0)) return null;
  const cxy = new Matrix(p, 1);
  for (let a = 0; a < p; a++) cxy.set(a, 0, (zy[a + 1] - n * mu[a + 1] * muY) / (n - 1));
  const beta = design.pinv.mmul(cxy);
  let explained = 0;
  const sdY = Math.sqrt(varY);
  const src2 = new Float64Array(m.sources.length);
  const meanSq = new Float64Array(m.sources.length);
  for (let a = 0; a < p; a++) {
    const b = beta.get(a, 0);
    explained += b * cxy.get(a, 0);
    const src = (b * sd[a]) / sdY;
    src2[m.drawSource[cols[a]]] += src * src;
    meanSq[m.drawSource[cols[a]]] += b * mu[a + 1];
  }
  const basis = kind === "linear" ? src2 : meanSq.map((v) => Math.max(0, v));
  const tot = basis.reduce((x, y) => x + y, 0);
  return {
    metric,
    design: kind,
    r2: explained / varY,
    sources: m.sources.map((s, j) => ({ source: s.id, src2: src2[j], share: tot > 0 ? basis[j] / tot : 0 })),
  };
}
