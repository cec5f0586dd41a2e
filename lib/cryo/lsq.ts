// Least-squares helpers for lib/cryo: straight-line fit with standard errors (boil-off rates) and
// a small Levenberg–Marquardt solver with covariance from the Jacobian (Kondo fits). Textbook
// formulas: e.g. Press et al., Numerical Recipes, ch. 15 (from memory).

export interface LinearFit {
  readonly slope: number;
  readonly intercept: number;
  readonly slopeStandardError: number;
  readonly meanX: number;
  readonly meanY: number;
  readonly residualRms: number;
  readonly n: number;
}

/** Ordinary least squares y = intercept + slope·x; needs ≥ 3 points and two distinct x. */
export function linearFit(xs: readonly number[], ys: readonly number[]): LinearFit {
  const n = xs.length;
  if (n < 3 || ys.length !== n) throw new Error("linearFit: need ≥ 3 paired points");
  const meanX = xs.reduce((s, x) => s + x, 0) / n;
  const meanY = ys.reduce((s, y) => s + y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  xs.forEach((x, i) => {
    sxx += (x - meanX) ** 2;
    sxy += (x - meanX) * ((ys[i] ?? NaN) - meanY);
  });
  if (sxx === 0) throw new Error("linearFit: all x values are equal");
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  const ssr = xs.reduce((s, x, i) => s + ((ys[i] ?? NaN) - intercept - slope * x) ** 2, 0);
  return {
    slope,
    intercept,
    slopeStandardError: Math.sqrt(ssr / (n - 2) / sxx),
    meanX,
    meanY,
    residualRms: Math.sqrt(ssr / n),
    n,
  };
}

/** Solve the small dense system A x = b by Gaussian elimination with partial pivoting. */
export function solveLinear(a: readonly (readonly number[])[], b: readonly number[]): number[] {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i] ?? NaN]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) {
      if (Math.abs(m[r]?.[col] ?? 0) > Math.abs(m[pivot]?.[col] ?? 0)) pivot = r;
    }
    const pivotRow = m[pivot];
    if (!pivotRow || pivotRow[col] === 0) throw new Error("solveLinear: singular matrix");
    [m[col], m[pivot]] = [pivotRow, m[col] ?? pivotRow];
    for (let r = 0; r < n; r++) {
      const row = m[r];
      if (r === col || !row) continue;
      const factor = (row[col] ?? 0) / (pivotRow[col] ?? NaN);
      for (let c = col; c <= n; c++) row[c] = (row[c] ?? 0) - factor * (pivotRow[c] ?? 0);
    }
  }
  return m.map((row, i) => (row[n] ?? NaN) / (row[i] ?? NaN));
}

function invert(a: readonly (readonly number[])[]): number[][] {
  const n = a.length;
  const columns = Array.from({ length: n }, (_, j) =>
    solveLinear(
      a,
      Array.from({ length: n }, (_, i) => (i === j ? 1 : 0)),
    ),
  );
  return Array.from({ length: n }, (_, i) => columns.map((col) => col[i] ?? NaN));
}

export interface NonlinearModel {
  /** Model value at x for parameters p. */
  value(p: readonly number[], x: number): number;
  /** ∂value/∂p_k at x. */
  gradient(p: readonly number[], x: number): number[];
}

export interface NonlinearFit {
  readonly parameters: number[];
  /** Covariance s²(JᵀJ)⁻¹ with s² = SSR/(n − p). */
  readonly covariance: number[][];
  readonly standardErrors: number[];
  readonly residualRms: number;
  readonly iterations: number;
  readonly converged: boolean;
}

function sumSquares(model: NonlinearModel, p: readonly number[], xs: readonly number[], ys: readonly number[]): number {
  return xs.reduce((s, x, i) => s + ((ys[i] ?? NaN) - model.value(p, x)) ** 2, 0);
}

/** Normal equations JᵀJ and Jᵀr at p. */
function normalEquations(model: NonlinearModel, p: readonly number[], xs: readonly number[], ys: readonly number[]) {
  const k = p.length;
  const jtj = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  const jtr = new Array<number>(k).fill(0);
  xs.forEach((x, i) => {
    const g = model.gradient(p, x);
    const r = (ys[i] ?? NaN) - model.value(p, x);
    for (let a = 0; a < k; a++) {
      jtr[a] = (jtr[a] ?? 0) + (g[a] ?? 0) * r;
      const row = jtj[a];
      if (!row) continue;
      for (let b = 0; b < k; b++) row[b] = (row[b] ?? 0) + (g[a] ?? 0) * (g[b] ?? 0);
    }
  });
  return { jtj, jtr };
}

/**
 * Levenberg–Marquardt (Marquardt's diagonal scaling). Returns the parameters, their covariance
 * from the Jacobian at the optimum, and whether the relative change in SSR fell below tolerance.
 */
export function levenbergMarquardt(
  model: NonlinearModel,
  xs: readonly number[],
  ys: readonly number[],
  initial: readonly number[],
  { maxIterations = 200, tolerance = 1e-12 } = {},
): NonlinearFit {
  let p = [...initial];
  let ssr = sumSquares(model, p, xs, ys);
  let lambda = 1e-3;
  let converged = false;
  let iterations = 0;
  for (; iterations < maxIterations && !converged; iterations++) {
    const { jtj, jtr } = normalEquations(model, p, xs, ys);
    let accepted = false;
    while (!accepted && lambda < 1e12) {
      const damped = jtj.map((row, a) => row.map((v, b) => (a === b ? v * (1 + lambda) : v)));
      let step: number[];
      try {
        step = solveLinear(damped, jtr);
      } catch {
        lambda *= 10;
        continue;
      }
      const trial = p.map((v, a) => v + (step[a] ?? 0));
      const trialSsr = sumSquares(model, trial, xs, ys);
      if (Number.isFinite(trialSsr) && trialSsr <= ssr) {
        converged = ssr - trialSsr <= tolerance * Math.max(ssr, Number.MIN_VALUE);
        p = trial;
        ssr = trialSsr;
        lambda = Math.max(lambda / 10, 1e-12);
        accepted = true;
      } else {
        lambda *= 10;
      }
    }
    if (!accepted) converged = true; // no downhill step left: at a minimum to machine precision
  }
  const n = xs.length;
  const dof = n - p.length;
  const s2 = dof > 0 ? ssr / dof : NaN;
  const covariance = invert(normalEquations(model, p, xs, ys).jtj).map((row) => row.map((v) => v * s2));
  return {
    parameters: p,
    covariance,
    standardErrors: covariance.map((row, i) => Math.sqrt(row[i] ?? NaN)),
    residualRms: Math.sqrt(ssr / n),
    iterations,
    converged,
  };
}
