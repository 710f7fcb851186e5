/**
 * In-place radix-2 complex FFT (private: the binned KDE and the diffusion selector use it).
 *
 * @module
 */

/** In-place forward (sign -1) or unnormalised inverse (sign +1) FFT; length a power of 2. */
export function fft(re: Float64Array, im: Float64Array, sign: 1 | -1 = -1): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i];
      re[i] = re[j];
      re[j] = t;
      t = im[i];
      im[i] = im[j];
      im[j] = t;
    }
  }
  // Twiddles from one table per length, each entry computed directly (not by recurrence)
  // to keep rounding at ~1 ulp.
  const [cosT, sinT] = twiddles(n);
  for (let len = 2; len <= n; len <<= 1) {
    const half = len >> 1, stride = n / len;
    for (let i = 0; i < n; i += len) {
      for (let k = 0; k < half; k++) {
        const wr = cosT[k * stride], wi = sign * sinT[k * stride];
        const a = i + k, b = a + half;
        const xr = re[b] * wr - im[b] * wi;
        const xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] += xr;
        im[a] += xi;
      }
    }
  }
}

const TABLES = new Map<number, [Float64Array, Float64Array]>();

/** cos and sin of 2πj/n for j < n/2 (cached per n). */
function twiddles(n: number): [Float64Array, Float64Array] {
  let t = TABLES.get(n);
  if (!t) {
    const half = Math.max(1, n >> 1);
    const c = new Float64Array(half), s = new Float64Array(half);
    for (let j = 0; j < half; j++) {
      c[j] = Math.cos((2 * Math.PI * j) / n);
      s[j] = Math.sin((2 * Math.PI * j) / n);
    }
    t = [c, s];
    if (TABLES.size > 32) TABLES.clear();
    TABLES.set(n, t);
  }
  return t;
}

/** Smallest power of two >= n. */
export function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p <<= 1;
  return p;
}

/** In-place N-d (1 or 2) FFT over a row-major padded grid. */
export function fftNd(
  re: Float64Array,
  im: Float64Array,
  M: readonly number[],
  sign: 1 | -1,
): void {
  if (M.length === 1) {
    fft(re, im, sign);
    return;
  }
  const [m0, m1] = M;
  for (let i = 0; i < m0; i++) {
    fft(re.subarray(i * m1, (i + 1) * m1), im.subarray(i * m1, (i + 1) * m1), sign);
  }
  const cr = new Float64Array(m0), ci = new Float64Array(m0);
  for (let j = 0; j < m1; j++) {
    for (let i = 0; i < m0; i++) {
      cr[i] = re[i * m1 + j];
      ci[i] = im[i * m1 + j];
    }
    fft(cr, ci, sign);
    for (let i = 0; i < m0; i++) {
      re[i * m1 + j] = cr[i];
      im[i * m1 + j] = ci[i];
    }
  }
}
