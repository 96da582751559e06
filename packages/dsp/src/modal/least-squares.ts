// Linear least squares by Householder QR for the residue fit (docs/methods.md#lsfd; Golub & Van Loan
// 2013, Matrix Computations, 4th ed., §5.3, from memory): many right-hand sides against one basis, the
// columns scaled first so pole and residual terms of very different size are resolved alike.

/**
 * Least squares min‖G·x − b‖ for every column b of B (G rows×np and B rows×nrhs, both column-major) by
 * Householder QR of the column-scaled G. Returns x as nrhs blocks of np values. Throws when G is rank deficient.
 */
export function leastSquares(G: Float64Array, rows: number, np: number, B: Float64Array, nrhs: number): Float64Array {
  const scale = new Float64Array(np);
  for (let c = 0; c < np; c++) {
    let s = 0;
    for (let k = 0; k < rows; k++) s += G[c * rows + k] * G[c * rows + k];
    s = Math.sqrt(s);
    if (!(s > 0) || !Number.isFinite(s)) throw new RangeError(`basis column ${c} is ${s}: a pole or residual term is undefined on the band`);
    scale[c] = s;
    for (let k = 0; k < rows; k++) G[c * rows + k] /= s;
  }
  const diag = new Float64Array(np);
  for (let j = 0; j < np; j++) {
    const cj = j * rows;
    let nrm = 0;
    for (let k = j; k < rows; k++) nrm += G[cj + k] * G[cj + k];
    nrm = Math.sqrt(nrm);
    if (!(nrm > 1e-10)) {
      throw new RangeError(
        `the fit is singular at unknown ${j} (${j < np - 2 || np % 2 === 1 ? `pole ${Math.floor(j / 2)}` : 'residual term'}): two poles too close for the band's resolution, or a basis the band cannot separate`,
      );
    }
    const alpha = G[cj + j] > 0 ? -nrm : nrm;
    G[cj + j] -= alpha; // v = x − α·e_j, stored in place
    let vv = 0;
    for (let k = j; k < rows; k++) vv += G[cj + k] * G[cj + k];
    diag[j] = alpha;
    const apply = (M: Float64Array, c: number) => {
      let s = 0;
      for (let k = j; k < rows; k++) s += G[cj + k] * M[c + k];
      s = (2 * s) / vv;
      for (let k = j; k < rows; k++) M[c + k] -= s * G[cj + k];
    };
    for (let c = j + 1; c < np; c++) apply(G, c * rows);
    for (let c = 0; c < nrhs; c++) apply(B, c * rows);
  }
  const x = new Float64Array(nrhs * np);
  for (let c = 0; c < nrhs; c++) {
    const b = c * rows;
    for (let i = np - 1; i >= 0; i--) {
      let s = B[b + i];
      for (let j = i + 1; j < np; j++) s -= G[j * rows + i] * x[c * np + j];
      x[c * np + i] = s / diag[i];
    }
    for (let i = 0; i < np; i++) x[c * np + i] /= scale[i];
  }
  return x;
}
