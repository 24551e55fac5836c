/**
 * Householder QR with sequential aliasing detection, for least-squares ANOVA.
 *
 * Why not ml-matrix's QrDecomposition: it has no column pivoting and calls a matrix rank-deficient only
 * when a diagonal element is exactly 0, which rounding never produces. ANOVA needs two things from the
 * factorisation: (1) a column that is (numerically) a combination of the columns before it must be
 * recognised and set aside — that is how a term aliased with blocks drops out, and how an interaction
 * loses df to empty cells; (2) the columns must otherwise stay in the order given, because the
 * sequential (Type I) sums of squares are the squared "effects" Q'z of each term's columns in that
 * order. This is the limited pivoting of LINPACK's dqrdc2 used by R's lm(): a column whose norm,
 * after removing its projection on the accepted columns, falls below `tol` times its original norm is
 * moved out; all others keep their order.
 */

/** Result of a sequential QR of an m x p matrix (given by columns) and a response z. */
export interface SequentialQr {
  /** number of accepted (linearly independent) columns */
  rank: number;
  /** for each input column: true if accepted, false if aliased with the columns before it */
  accepted: boolean[];
  /**
   * Q'z (length m): entry i < rank belongs to the i-th accepted column (its squared value is that
   * column's sequential sum of squares); entries rank..m-1 span the residual space.
   */
  effects: Float64Array;
  /** upper-triangular R of the accepted columns, rank x rank, row-major */
  r: Float64Array;
}

/** R's lm() default: a column is aliased when less than 1e-7 of its norm is new. */
export const DEFAULT_ALIAS_TOL = 1e-7;

function norm(v: Float64Array, from: number): number {
  // scaled sum of squares: no overflow/underflow whatever the magnitude of the cell means
  let scale = 0;
  let ssq = 1;
  for (let i = from; i < v.length; i++) {
    const a = Math.abs(v[i]);
    if (a === 0) continue;
    if (scale < a) {
      ssq = 1 + ssq * (scale / a) ** 2;
      scale = a;
    } else ssq += (a / scale) ** 2;
  }
  return scale * Math.sqrt(ssq);
}

interface Reflector {
  start: number;
  v: Float64Array;
  beta: number;
}

function reflect(h: Reflector, x: Float64Array): void {
  let dot = 0;
  for (let i = h.start; i < x.length; i++) dot += h.v[i] * x[i];
  const s = h.beta * dot;
  if (s === 0) return;
  for (let i = h.start; i < x.length; i++) x[i] -= s * h.v[i];
}

/**
 * Factorise the columns in order, setting aside each column that is aliased with those before it.
 * @param columns the model-matrix columns (each of length m); not modified
 * @param z the response (length m); not modified
 * @param tol relative norm below which a column counts as aliased
 * @returns rank, accepted flags, effects Q'z and R
 * @example sequentialQr([ones, x, twiceX], y).accepted // [true, true, false]
 */
export function sequentialQr(columns: Float64Array[], z: Float64Array, tol = DEFAULT_ALIAS_TOL): SequentialQr {
  const m = z.length;
  const reflectors: Reflector[] = [];
  const rColumns: Float64Array[] = [];
  const accepted: boolean[] = [];
  const effects = Float64Array.from(z);
  for (const column of columns) {
    if (column.length !== m) throw new RangeError(`column length ${column.length} differs from response length ${m}`);
    const work = Float64Array.from(column);
    const original = norm(work, 0);
    for (const h of reflectors) reflect(h, work);
    const k = reflectors.length;
    const remaining = k < m ? norm(work, k) : 0;
    if (!(original > 0) || remaining <= tol * original) {
      accepted.push(false);
      continue;
    }
    // Reflect work[k..m) onto -sign(work[k]) * remaining * e_k (sign chosen to avoid cancellation).
    const alpha = work[k] >= 0 ? -remaining : remaining;
    const v = new Float64Array(m);
    for (let i = k; i < m; i++) v[i] = work[i];
    v[k] -= alpha;
    let vv = 0;
    for (let i = k; i < m; i++) vv += v[i] * v[i];
    const h: Reflector = { start: k, v, beta: 2 / vv };
    reflectors.push(h);
    reflect(h, effects);
    const rCol = new Float64Array(k + 1);
    for (let i = 0; i < k; i++) rCol[i] = work[i];
    rCol[k] = alpha;
    rColumns.push(rCol);
    accepted.push(true);
  }
  const rank = reflectors.length;
  const r = new Float64Array(rank * rank);
  rColumns.forEach((col, j) => {
    for (let i = 0; i < col.length; i++) r[i * rank + j] = col[i];
  });
  return { rank, accepted, effects, r };
}

/**
 * Coefficients b of the accepted columns from R b = (Q'z)[0..rank) by back-substitution.
 * @returns one coefficient per accepted column, in order
 */
export function qrCoefficients(qr: SequentialQr): Float64Array {
  const { rank, r, effects } = qr;
  const b = new Float64Array(rank);
  for (let i = rank - 1; i >= 0; i--) {
    let s = effects[i];
    for (let j = i + 1; j < rank; j++) s -= r[i * rank + j] * b[j];
    b[i] = s / r[i * rank + i];
  }
  return b;
}

/** Residual sum of squares of the least-squares fit: the squared effects beyond the rank. */
export function qrResidualSs(qr: SequentialQr): number {
  let s = 0;
  for (let i = qr.rank; i < qr.effects.length; i++) s += qr.effects[i] * qr.effects[i];
  return s;
}
