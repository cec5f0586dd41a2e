// Interpolation helpers for lib/cryo: piecewise-linear and monotone cubic (Fritsch–Carlson, as in
// PCHIP: F. N. Fritsch & R. E. Carlson, SIAM J. Numer. Anal. 17, 238 (1980)). Callers check
// ranges; these functions assume xs strictly increasing and x inside [xs[0], xs[n−1]].

function at(values: readonly number[], i: number): number {
  const v = values[i];
  if (v === undefined) throw new Error(`interp: index ${i} out of bounds`);
  return v;
}

/** Index i with xs[i] ≤ x ≤ xs[i+1] (binary search). */
function segment(xs: readonly number[], x: number): number {
  let lo = 0;
  let hi = xs.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (at(xs, mid) <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}

export function linearInterpolate(xs: readonly number[], ys: readonly number[], x: number): number {
  const i = segment(xs, x);
  const x0 = at(xs, i);
  const x1 = at(xs, i + 1);
  const y0 = at(ys, i);
  return y0 + ((at(ys, i + 1) - y0) * (x - x0)) / (x1 - x0);
}

/** Fritsch–Carlson end-point and interior slopes: monotone data gives a monotone curve. */
function pchipSlopes(xs: readonly number[], ys: readonly number[]): number[] {
  const n = xs.length;
  const h: number[] = [];
  const delta: number[] = [];
  for (let i = 0; i < n - 1; i++) {
    h.push(at(xs, i + 1) - at(xs, i));
    delta.push((at(ys, i + 1) - at(ys, i)) / at(h, i));
  }
  if (n === 2) return [at(delta, 0), at(delta, 0)];
  const d: number[] = new Array<number>(n).fill(0);
  for (let i = 1; i < n - 1; i++) {
    const d0 = at(delta, i - 1);
    const d1 = at(delta, i);
    if (d0 * d1 > 0) {
      const w1 = 2 * at(h, i) + at(h, i - 1);
      const w2 = at(h, i) + 2 * at(h, i - 1);
      d[i] = (w1 + w2) / (w1 / d0 + w2 / d1);
    }
  }
  d[0] = endSlope(at(h, 0), at(h, 1), at(delta, 0), at(delta, 1));
  d[n - 1] = endSlope(at(h, n - 2), at(h, n - 3), at(delta, n - 2), at(delta, n - 3));
  return d;
}

function endSlope(h0: number, h1: number, del0: number, del1: number): number {
  const d = ((2 * h0 + h1) * del0 - h0 * del1) / (h0 + h1);
  if (Math.sign(d) !== Math.sign(del0)) return 0;
  if (Math.sign(del0) !== Math.sign(del1) && Math.abs(d) > Math.abs(3 * del0)) return 3 * del0;
  return d;
}

/** Build a monotone cubic interpolant through (xs, ys); xs strictly increasing, ≥ 2 points. */
export function pchip(xs: readonly number[], ys: readonly number[]): (x: number) => number {
  const d = pchipSlopes(xs, ys);
  return (x: number) => {
    const i = segment(xs, x);
    const x0 = at(xs, i);
    const hseg = at(xs, i + 1) - x0;
    const t = (x - x0) / hseg;
    const t2 = t * t;
    const t3 = t2 * t;
    return (
      (2 * t3 - 3 * t2 + 1) * at(ys, i) +
      (t3 - 2 * t2 + t) * hseg * at(d, i) +
      (-2 * t3 + 3 * t2) * at(ys, i + 1) +
      (t3 - t2) * hseg * at(d, i + 1)
    );
  };
}
