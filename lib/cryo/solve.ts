// Numerical helpers for lib/cryo: a bracketed root solve (used to invert the ITS-90 and
// Callendar–Van Dusen equations). Bisection is chosen over faster methods because the brackets
// are known and monotonic; it cannot wander outside them.

/**
 * Root of f on [lo, hi] by bisection. f(lo) and f(hi) must differ in sign (or one be zero);
 * otherwise the caller's bracket is wrong and an Error is thrown.
 */
export function bisect(f: (x: number) => number, lo: number, hi: number, tolerance = 1e-12): number {
  let a = lo;
  let b = hi;
  let fa = f(a);
  const fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (Math.sign(fa) === Math.sign(fb)) {
    throw new Error(`bisect: no sign change on [${lo}, ${hi}]`);
  }
  for (let i = 0; i < 200 && b - a > tolerance * Math.max(1, Math.abs(a)); i++) {
    const m = (a + b) / 2;
    const fm = f(m);
    if (fm === 0) return m;
    if (Math.sign(fm) === Math.sign(fa)) {
      a = m;
      fa = fm;
    } else {
      b = m;
    }
  }
  return (a + b) / 2;
}
