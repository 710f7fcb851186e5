/**
 * The binned route of the refit bootstrap (private): two Gaussian KDEs with a bandwidth
 * rule scaled from the data covariance (Scott's), evaluated together on grids that adapt
 * to the data (range and spacing from the data and the kernels, one grid around each side
 * when they lie apart), and expectations under the mixture of functions of the log-ratio.
 * A bootstrap replicate is the same computation with bootstrap counts as weights: the
 * counts give the resample's covariance, hence its bandwidth, and its binning.
 *
 * @module
 */
import { binnedKde, type NodeGrid, paddedSize } from "../density/binned_kde.ts";
import { scottFactor } from "../density/bandwidth.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { MixtureWeight } from "./integration.ts";
import { DECOMPOSITION_WEIGHTS } from "./refit_quantities.ts";

/** Kernel reach used for the grid margins, in kernel standard deviations. */
const MARGIN_SD = 6.5;
/** Wanted node spacing: the smaller kernel standard deviation over this. */
const NODES_PER_SD = 3;
/** Largest padded FFT size per axis: 2^16 in 1-D, 512 in 2-D. */
const MAX_PADDED = [1 << 16, 512];

/** The data of the binned route: both sides, the dimension, the rule. */
export interface PairData {
  readonly d: number;
  readonly real: Float64Array;
  readonly fake: Float64Array;
  readonly nReal: number;
  readonly nFake: number;
}

/** The grids (one, or one per side when apart) and what was decided. */
export interface PairPlan {
  readonly boxes: readonly NodeGrid[];
  readonly notes: readonly string[];
}

/**
 * Scott's kernel covariance of a resample given by counts (frequency weights summing to n;
 * null: every point once): `n^(-2/(d+4))` times the resample's covariance (n - 1 divisor).
 */
export function scottBandwidth(
  x: Float64Array,
  n: number,
  d: number,
  counts: Uint32Array | null,
): Float64Array {
  const mean = new Float64Array(d);
  let total = 0;
  for (let i = 0; i < n; i++) {
    const c = counts ? counts[i] : 1;
    if (c === 0) continue;
    total += c;
    for (let a = 0; a < d; a++) mean[a] += c * x[i * d + a];
  }
  for (let a = 0; a < d; a++) mean[a] /= total;
  const cov = new Float64Array(d * d);
  for (let i = 0; i < n; i++) {
    const c = counts ? counts[i] : 1;
    if (c === 0) continue;
    for (let a = 0; a < d; a++) {
      const da = x[i * d + a] - mean[a];
      for (let b = a; b < d; b++) cov[a * d + b] += c * da * (x[i * d + b] - mean[b]);
    }
  }
  const f = scottFactor(total, d);
  for (let a = 0; a < d; a++) {
    for (let b = a; b < d; b++) {
      const v = (cov[a * d + b] / (total - 1)) * f * f;
      cov[a * d + b] = v;
      cov[b * d + a] = v;
    }
  }
  for (let a = 0; a < d; a++) {
    if (!(cov[a * d + a] > 0)) {
      throw new SaddleError(
        "singular",
        `column ${a} has zero variance${
          counts ? " in a resample" : ""
        }: a bandwidth scaled from the data covariance would be singular; drop the constant ` +
          "column, or fit with an explicit bandwidth matrix",
        { column: a, parameter: "fit" },
      );
    }
  }
  return cov;
}

function range(x: Float64Array, n: number, d: number, a: number): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = x[i * d + a];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/**
 * Grids for the pair: per axis, the data range of both sides widened by 6.5 kernel
 * standard deviations (10% above the plug-in's, for the resamples' bandwidths), spacing a
 * third of the smaller kernel standard deviation, then refined to fill the FFT size it
 * needs. When one grid would need more than the size limit and the sides' own ranges lie
 * apart, one grid around each side; otherwise the spacing grows to fit (and the error
 * estimate grows with it). Returns undefined when the spacing would exceed the kernel's
 * standard deviation (the binned route does not apply).
 */
export function planPair(data: PairData, hReal: Float64Array, hFake: Float64Array):
  | PairPlan
  | undefined {
  const { d } = data;
  const sdR = Array.from({ length: d }, (_, a) => 1.1 * Math.sqrt(hReal[a * d + a]));
  const sdF = Array.from({ length: d }, (_, a) => 1.1 * Math.sqrt(hFake[a * d + a]));
  const sdMax = sdR.map((s, a) => Math.max(s, sdF[a]));
  const sdMin = sdR.map((s, a) => Math.min(s, sdF[a]) / 1.1);
  const rR = Array.from({ length: d }, (_, a) => range(data.real, data.nReal, d, a));
  const rF = Array.from({ length: d }, (_, a) => range(data.fake, data.nFake, d, a));
  const boxOf = (rs: [number, number][][]) =>
    Array.from({ length: d }, (_, a) => {
      const lo = Math.min(...rs.map((r) => r[a][0])) - MARGIN_SD * sdMax[a];
      const hi = Math.max(...rs.map((r) => r[a][1])) + MARGIN_SD * sdMax[a];
      return [lo, hi] as const;
    });
  const limit = MAX_PADDED[d - 1];
  const fits = (box: readonly (readonly [number, number])[]) =>
    box.every(([lo, hi], a) => {
      const step = sdMin[a] / NODES_PER_SD;
      const g = Math.ceil((hi - lo) / step) + 1;
      return paddedSize({ lower: [lo], step: [step], size: [g] }, [sdMax[a]])[0] <= limit;
    });
  const notes: string[] = [];
  const both = boxOf([rR, rF]);
  let boxes: (readonly (readonly [number, number])[])[] = [both];
  if (!fits(both)) {
    const bR = boxOf([rR]), bF = boxOf([rF]);
    const apart = bR.some(([lo, hi], a) => hi <= bF[a][0] || bF[a][1] <= lo);
    if (apart) {
      boxes = [bR, bF];
      notes.push("the two sample sets lie apart: one grid around each");
    }
  }
  const grids: NodeGrid[] = [];
  for (const box of boxes) {
    const lower: number[] = [], step: number[] = [], size: number[] = [];
    for (let a = 0; a < d; a++) {
      const [lo, hi] = box[a];
      const want = sdMin[a] / NODES_PER_SD;
      const g0 = Math.ceil((hi - lo) / want) + 1;
      // The padded size this needs (capped), then the finest spacing that still fits it.
      const P = Math.min(
        limit,
        paddedSize({ lower: [lo], step: [want], size: [g0] }, [sdMax[a]])[0],
      );
      const reach = Math.sqrt(2 * 16 * Math.LN10) * sdMax[a];
      const s = (hi - lo + reach) / (P - 4);
      if (s > sdMin[a]) return undefined;
      if (s > want * 1.05) {
        notes.push(
          `axis ${a}: node spacing ${s.toPrecision(3)} is coarser than a third of the kernel ` +
            "standard deviation (the grid is at its size limit); the binning error estimate covers it",
        );
      }
      lower.push(lo);
      step.push(s);
      size.push(Math.floor((hi - lo) / s) + 1);
    }
    grids.push({ lower, step, size });
  }
  return { boxes: grids, notes };
}

/** Per-box binned densities of both sides. */
export function pairDensities(
  data: PairData,
  plan: PairPlan,
  hReal: Float64Array,
  hFake: Float64Array,
  counts: { real: Uint32Array | null; fake: Uint32Array | null },
  correct = true,
): { p: Float64Array; q: Float64Array }[] {
  return plan.boxes.map((grid) => {
    const [p, q] = binnedKde({
      d: data.d,
      grid,
      correct,
      sides: [
        { points: data.real, bandwidth: hReal, ...(counts.real ? { weights: counts.real } : {}) },
        { points: data.fake, bandwidth: hFake, ...(counts.fake ? { weights: counts.fake } : {}) },
      ],
    });
    return { p, q };
  });
}

/** Expectations under the mixture, per weight, with a coarse (every other node) version. */
export interface PairSums {
  /** `E_m[w_k]` on all nodes. */
  readonly fine: Float64Array;
  /** The same on every other node per axis. */
  readonly coarse: Float64Array;
  /** Box volume times the largest `m |w_k - E_m[w_k]|` on the grids' rims (the tail). */
  readonly tail: Float64Array;
}

/**
 * `E_m[w] = (E_p[w] + E_q[w]) / 2`, each side's expectation self-normalised by its grid
 * mass (a constant integrand is exact; sides apart keep their weights of 1/2); nodes where
 * one density is 0 use w at ±Infinity, nodes where both are 0 add nothing.
 */
export function pairSums(
  plan: PairPlan,
  dens: readonly { p: Float64Array; q: Float64Array }[],
  weights: readonly MixtureWeight[],
  withErrors: boolean,
): PairSums {
  const K = weights.length;
  // The three decomposition integrands, when they lead the list, straight from p and q.
  const fused = K >= 3 && weights[0] === DECOMPOSITION_WEIGHTS.value &&
    weights[1] === DECOMPOSITION_WEIGHTS.klRealMix &&
    weights[2] === DECOMPOSITION_WEIGHTS.klFakeMix;
  const first = fused ? 3 : 0;
  const sp = new Float64Array(K), sq = new Float64Array(K);
  const cp = new Float64Array(K), cq = new Float64Array(K);
  let mp = 0, mq = 0, cmp = 0, cmq = 0;
  const rimMax = plan.boxes.map(() => new Float64Array(K));
  const wv = new Float64Array(K);
  // First pass: sums; the rim pass needs the means, so rim values are kept per node index.
  const rims: { box: number; m: number; w: Float64Array }[] = [];
  plan.boxes.forEach((grid, bIdx) => {
    const { p, q } = dens[bIdx];
    const vol = grid.step.reduce((a, b) => a * b, 1);
    const ny = grid.size.length === 2 ? grid.size[1] : 1;
    const nx = grid.size[0];
    let bp = 0, bq = 0, bcp = 0, bcq = 0;
    const tp = new Float64Array(K), tq = new Float64Array(K);
    const tcp = new Float64Array(K), tcq = new Float64Array(K);
    for (let i = 0; i < nx; i++) {
      for (let j = 0; j < ny; j++) {
        const k = i * ny + j;
        const a = p[k], c = q[k];
        if (a === 0 && c === 0) continue;
        if (fused) decompositionAt(a, c, wv);
        if (K > first) {
          const r = a === c ? 0 : Math.log(a) - Math.log(c);
          for (let w = first; w < K; w++) wv[w] = weights[w](r);
        }
        bp += a;
        bq += c;
        for (let w = 0; w < K; w++) {
          if (a > 0) tp[w] += a * wv[w];
          if (c > 0) tq[w] += c * wv[w];
        }
        if (withErrors) {
          if ((i & 1) === 0 && (j & 1) === 0) {
            bcp += a;
            bcq += c;
            for (let w = 0; w < K; w++) {
              if (a > 0) tcp[w] += a * wv[w];
              if (c > 0) tcq[w] += c * wv[w];
            }
          }
          const rim = i === 0 || i === nx - 1 || (ny > 1 && (j === 0 || j === ny - 1));
          if (rim) rims.push({ box: bIdx, m: 0.5 * (a + c), w: Float64Array.from(wv) });
        }
      }
    }
    mp += bp * vol;
    mq += bq * vol;
    cmp += bcp * vol;
    cmq += bcq * vol;
    for (let w = 0; w < K; w++) {
      sp[w] += tp[w] * vol;
      sq[w] += tq[w] * vol;
      cp[w] += tcp[w] * vol;
      cq[w] += tcq[w] * vol;
    }
  });
  if (!(mp > 0 && mq > 0)) {
    throw new SaddleError(
      "non-finite",
      `the binned grid found no mass of the ${mp > 0 ? "fake" : "real"} density`,
      { parameter: mp > 0 ? "fake" : "real" },
    );
  }
  const fine = new Float64Array(K), coarse = new Float64Array(K), tail = new Float64Array(K);
  for (let w = 0; w < K; w++) {
    fine[w] = 0.5 * (sp[w] / mp + sq[w] / mq);
    coarse[w] = withErrors && cmp > 0 && cmq > 0 ? 0.5 * (cp[w] / cmp + cq[w] / cmq) : NaN;
  }
  if (withErrors) {
    for (const r of rims) {
      for (let w = 0; w < K; w++) {
        const dev = r.w[w] === fine[w] ? 0 : r.m * Math.abs(r.w[w] - fine[w]);
        if (dev > rimMax[r.box][w]) rimMax[r.box][w] = dev;
      }
    }
    plan.boxes.forEach((grid, b) => {
      const volume = grid.size.reduce((v, g, a) => v * g * grid.step[a], 1);
      for (let w = 0; w < K; w++) tail[w] += rimMax[b][w] * volume;
    });
  }
  return { fine, coarse, tail };
}

/**
 * The decomposition integrands at densities a = p, c = q (not both 0), into w[0..2]:
 * with s = p / (p + q) = σ(r), ln s and ln(1 - s) from the logs of p, q and p + q, the
 * same functions as {@linkcode DECOMPOSITION_WEIGHTS} at r = ln p - ln q.
 */
function decompositionAt(a: number, c: number, w: Float64Array): void {
  const t = a + c;
  const s = a / t, u = c / t;
  const ls = a > 0 ? Math.log(s) : 0, lu = c > 0 ? Math.log(u) : 0;
  const xs = s * ls, xu = u * lu;
  w[0] = 2 * (xs + xu);
  w[1] = 2 * (s * Math.LN2 + xs);
  w[2] = 2 * (u * Math.LN2 + xu);
}

/** Bootstrap counts of `n` indices drawn into `idx`, written into `out`. */
export function countsOf(idx: Uint32Array, out: Uint32Array): Uint32Array {
  out.fill(0);
  for (let i = 0; i < idx.length; i++) out[idx[i]]++;
  return out;
}
