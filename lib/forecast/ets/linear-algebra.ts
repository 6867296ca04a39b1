/**
 * The small dense linear algebra of the least-squares searches: a Cholesky solve and the
 * damped Levenberg–Marquardt system. Matrices are p×p, row-major, in Float64Arrays; nothing is
 * allocated. Pure TypeScript.
 */

/**
 * The Levenberg–Marquardt system (A + λ·diag(A))·step = rhs (Marquardt 1963): copies the upper
 * triangle of `a` (row-major p×p) into the full symmetric `chol`, scales its diagonal by 1 + λ,
 * and puts `rhs` into `step`, ready for {@link choleskySolve}.
 */
export function dampedSystem(a: Float64Array, rhs: Float64Array, lambda: number, p: number, chol: Float64Array, step: Float64Array): void {
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      const v = a[i * p + j];
      chol[i * p + j] = v;
      chol[j * p + i] = v;
    }
    chol[i * p + i] = a[i * p + i] * (1 + lambda) + 1e-300;
    step[i] = rhs[i];
  }
}

/**
 * Solves C·x = b in place by Cholesky factorisation (Golub & Van Loan, Matrix Computations,
 * §4.2): `c` holds the symmetric p×p matrix row-major and is overwritten by its lower factor;
 * `x` holds b on entry and the solution on return. Returns false, leaving `x` partly
 * overwritten, when C is not positive definite (a NaN pivot included). O(p³); no allocation.
 */
export function choleskySolve(c: Float64Array, x: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let d = c[j * p + j];
    for (let k = 0; k < j; k++) d -= c[j * p + k] * c[j * p + k];
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    c[j * p + j] = ljj;
    for (let i = j + 1; i < p; i++) {
      let v = c[i * p + j];
      for (let k = 0; k < j; k++) v -= c[i * p + k] * c[j * p + k];
      c[i * p + j] = v / ljj;
    }
  }
  for (let i = 0; i < p; i++) {
    let v = x[i];
    for (let k = 0; k < i; k++) v -= c[i * p + k] * x[k];
    x[i] = v / c[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let v = x[i];
    for (let k = i + 1; k < p; k++) v -= c[k * p + i] * x[k];
    x[i] = v / c[i * p + i];
  }
  return true;
}
