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
  for (let len = 2; len <= n; len <<= 1) {
    const ang = (sign * 2 * Math.PI) / len;
    const half = len >> 1;
    // Twiddles computed directly (not by recurrence) to keep rounding at ~1 ulp.
    const wr = new Float64Array(half), wi = new Float64Array(half);
    for (let k = 0; k < half; k++) {
      wr[k] = Math.cos(ang * k);
      wi[k] = Math.sin(ang * k);
    }
    for (let i = 0; i < n; i += len) {
      for (let k = 0; k < half; k++) {
        const a = i + k, b = a + half;
        const xr = re[b] * wr[k] - im[b] * wi[k];
        const xi = re[b] * wi[k] + im[b] * wr[k];
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] += xr;
        im[a] += xi;
      }
    }
  }
}

/** Smallest power of two >= n. */
export function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p <<= 1;
  return p;
}
