/**
 * The studentized range distribution Q = W / S (range W of k standard normals, S² an independent
 * chi-square(ν)/ν), for Tukey's HSD.
 *
 * Why not jstat: jStat.tukey is a port of R's ptukey/qtukey (Copenhaver & Holland 1988 quadrature
 * with loose tolerances). Measured against the SciPy/mpmath columns of
 * shared/reference/r-datasets/studentized-range.json it is off by up to 4e-8 in the cdf (1.3e-9 at
 * df >= 20) and 2.4e-6 relative in the quantile: not enough for intervals checked to 1e-9, and its
 * upper tail is 1 - cdf, which loses small adjusted p-values altogether.
 *
 * Here both tails are double integrals evaluated by adaptive Gauss–Kronrod (7/15 points) to about
 * 1e-14 relative:
 *
 *   P(W <= w) = k ∫ φ(z) [Φ(z + w) - Φ(z)]^{k-1} dz
 *   P(W >  w) = k ∫ φ(z) Q(z + w) Σ_{i=0}^{k-2} A^i B^{k-2-i} dz,   A = Q(z), B = Φ(z + w) - Φ(z)
 *
 * (the second from 1 = k ∫ φ Q(z)^{k-1} dz and A^{k-1} - B^{k-1} = (A - B) Σ A^i B^{k-2-i} with
 * A - B = Q(z + w): every term is positive, so a tail of 1e-20 keeps its digits), and
 *
 *   P(Q <= q) = ∫_0^∞ f_ν(s) P(W <= q s) ds,   f_ν the density of S = sqrt(χ²_ν / ν).
 */
import { jStat, normalUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { lgamma, lgammaCorrection, log1pmx } from './special-functions.js';

const QUANTILE_MEMO_SIZE = 512;
/** studentizedRangeQuantile's answers by "p|k|df", oldest first (a plain FIFO bound). */
const quantileMemo = new Map<string, number>();

const LN_SQRT_2PI = 0.9189385332046727418;
const INV_SQRT_2PI = 0.3989422804014327;
// Stop when the summed |K15 - G7| is below this fraction of the integral. |K15 - G7| is the error
// of the 7-point rule; the 15-point value is far better (measured: 1e-14 absolute on the cdf grid
// of studentized-range.json), so 1e-10 buys full accuracy at a third of the cost of 1e-13.
const REL_TOL = 1e-10;

function check(q: number, k: number, df: number): void {
  if (Number.isNaN(q)) throw new StatsInputError(`studentized range: q must be a number, got ${q}`, q);
  if (!Number.isInteger(k) || k < 2) throw new StatsInputError(`studentized range: number of means must be an integer >= 2, got ${k}`, k);
  if (!(df > 0)) throw new StatsInputError(`studentized range: df must be > 0, got ${df}`, df);
}

/**
 * For w >= 0: A = Q(z), B = Φ(z + w) - Φ(z) and C = Q(z + w), from two directly computed normal
 * tails chosen so that the small quantities (B, and C or A) never come from a cancelling difference.
 */
function normalPieces(z: number, w: number): { a: number; b: number; c: number } {
  if (z >= 0) {
    const qz = normalUpperTail(z);
    const qzw = normalUpperTail(z + w);
    return { a: qz, b: qz - qzw, c: qzw };
  }
  const pz = normalUpperTail(-z); // Φ(z)
  if (z + w <= 0) {
    const pzw = normalUpperTail(-z - w); // Φ(z + w)
    return { a: 1 - pz, b: pzw - pz, c: 1 - pzw };
  }
  const qzw = normalUpperTail(z + w);
  return { a: 1 - pz, b: 1 - qzw - pz, c: qzw };
}

/** Both tails of the range W of k standard normals at w >= 0. */
function rangeTail(w: number, k: number, upper: boolean): number {
  if (w <= 0) return upper ? 1 : 0;
  const integrand = upper
    ? (z: number): number => {
        const { a, b, c } = normalPieces(z, w);
        // Σ_{i=0}^{k-2} a^i b^{k-2-i} by the recurrence s_j = a s_{j-1} + b^j (no division by b)
        let sum = 1;
        let bj = 1;
        for (let j = 1; j <= k - 2; j++) {
          bj *= b;
          sum = a * sum + bj;
        }
        return Math.exp(-0.5 * z * z) * INV_SQRT_2PI * c * sum;
      }
    : (z: number): number => Math.exp(-0.5 * z * z) * INV_SQRT_2PI * Math.pow(normalPieces(z, w).b, k - 1);
  // Mass lies within |z| < 9 (φ < 1e-17 beyond) and, for the upper tail, around z = -w/2 where
  // φ(z) Q(z + w) peaks; the breakpoints let the adaptive rule find that peak when w is large.
  const lo = Math.min(-9, -w / 2 - 7);
  const points = [lo, -w / 2 - 2, -w / 2, -w / 2 + 2, 0, 9].filter((p) => p >= lo && p <= 9).sort((p, q) => p - q);
  return k * integrate(integrand, points, REL_TOL);
}

/** ln of the density of S = sqrt(χ²_ν/ν) at s > 0; Stirling form for ν/2 >= 10 to avoid cancellation. */
function logChiDensity(s: number, df: number): number {
  const h = df / 2;
  if (h >= 10) return Math.LN2 + 0.5 * Math.log(h) - LN_SQRT_2PI - lgammaCorrection(h) - Math.log(s) + h * log1pmx(s * s - 1);
  return h * Math.log(h) - lgamma(h) + Math.LN2 + (df - 1) * Math.log(s) - h * s * s;
}

function studentizedTail(q: number, k: number, df: number, upper: boolean): number {
  check(q, k, df);
  if (q <= 0) return upper ? 1 : 0;
  if (q === Infinity) return upper ? 0 : 1;
  if (df === Infinity) return Math.min(1, Math.max(0, rangeTail(q, k, upper)));
  const integrand = (s: number): number => (s <= 0 ? 0 : Math.exp(logChiDensity(s, df)) * rangeTail(q * s, k, upper));
  // S has mean ~1 and sd ~1/sqrt(2ν); its density is below e^-60 of its peak beyond 1 + 11/sqrt(ν)
  // (and s^(ν-1) kills small s). The upper tail weights small s, the lower tail large s, so the
  // breakpoints spread over that whole range.
  const sd = 1 / Math.sqrt(2 * df);
  const hi = 1 + 16 * sd + (df < 10 ? 3 : 0);
  const points = [0, Math.max(0.05, 1 - 4 * sd), Math.max(0.1, 1 - 2 * sd), 1, 1 + 2 * sd, 1 + 5 * sd, hi].sort((p, r) => p - r);
  // quadrature rounding can put a probability a few ulps outside [0, 1]
  return Math.min(1, Math.max(0, integrate(integrand, points, REL_TOL)));
}

/**
 * P(Q <= q) of the studentized range with k means and df error degrees of freedom.
 * @param q the studentized range value (>= 0)
 * @param k number of means (integer >= 2)
 * @param df error degrees of freedom (> 0; Infinity for known σ)
 * @throws StatsInputError naming the bad argument
 * @example studentizedRangeCdf(3.5, 3, 20) // 0.944108150918250 (SciPy studentized_range.cdf)
 */
export function studentizedRangeCdf(q: number, k: number, df: number): number {
  return studentizedTail(q, k, df, false);
}

/**
 * P(Q > q), computed directly (not 1 - cdf), e.g. Tukey's adjusted p-value.
 * @example studentizedRangeUpperTail(3, 2, 5) // 0.08735930812736 (2 P(T_5 > 3/√2))
 */
export function studentizedRangeUpperTail(q: number, k: number, df: number): number {
  return studentizedTail(q, k, df, true);
}

/**
 * The quantile q with P(Q <= q) = p, by the Illinois variant of regula falsi on the smaller tail,
 * started from a bracket around jstat's approximation (good to ~1e-5).
 * @throws StatsInputError for p outside (0, 1)
 * @example studentizedRangeQuantile(0.95, 3, 51) // 3.41388256164 (R uniroot on ptukey, warpbreaks.json)
 */
export function studentizedRangeQuantile(p: number, k: number, df: number): number {
  if (!(p > 0 && p < 1)) throw new StatsInputError(`studentized range quantile: p must be between 0 and 1, got ${p}`, p);
  check(1, k, df);
  // A pure function of (p, k, df), each solve ~50-70 ms at large df, and an analysis asks for the
  // same triple once per term with the same number of levels: remember the last few.
  const key = `${p}|${k}|${df}`;
  const known = quantileMemo.get(key);
  if (known !== undefined) return known;
  const q = solveQuantile(p, k, df);
  if (quantileMemo.size >= QUANTILE_MEMO_SIZE) quantileMemo.delete(quantileMemo.keys().next().value!);
  quantileMemo.set(key, q);
  return q;
}

function solveQuantile(p: number, k: number, df: number): number {
  // g(q) increases in q; work on the smaller tail for relative accuracy
  const g =
    p > 0.5
      ? (q: number): number => 1 - p - studentizedRangeUpperTail(q, k, df)
      : (q: number): number => studentizedRangeCdf(q, k, df) - p;
  const guess = jStat.tukey.inv(p, k, Math.min(df, 1e5));
  return solveIncreasing(g, Number.isFinite(guess) && guess > 0 ? guess : 3);
}

/** Root of an increasing function by bracketing and the Illinois method (to ~1e-15 relative). */
function solveIncreasing(g: (q: number) => number, start: number): number {
  // jstat's start is good to ~1e-5 relative, so a ±1e-4 bracket usually holds; widen until it does.
  let step = 1e-4 * start;
  let lo = start - step;
  let hi = start + step;
  let glo = g(lo);
  let ghi = g(hi);
  while (glo > 0) {
    step *= 4;
    hi = lo;
    ghi = glo;
    lo = Math.max(lo - step, lo / 4);
    glo = g(lo);
  }
  while (ghi < 0) {
    step *= 4;
    lo = hi;
    glo = ghi;
    hi += step;
    ghi = g(hi);
  }
  let side = 0;
  for (let iter = 0; iter < 100; iter++) {
    const x = (lo * ghi - hi * glo) / (ghi - glo);
    const gx = g(x);
    if (gx === 0 || hi - lo <= 2e-15 * x) return x;
    if (gx < 0) {
      lo = x;
      glo = gx;
      if (side === -1) ghi /= 2;
      side = -1;
    } else {
      hi = x;
      ghi = gx;
      if (side === 1) glo /= 2;
      side = 1;
    }
    if (Math.abs(hi - lo) <= 1e-15 * x) return x;
  }
  return (lo + hi) / 2;
}

// ---- adaptive Gauss–Kronrod quadrature ----------------------------------------------------------

// 15-point Kronrod extension of the 7-point Gauss–Legendre rule (QUADPACK qk15; Piessens et al.
// 1983). Nodes in [0, 1) of the symmetric rule, odd-indexed ones are the Gauss nodes. The spec
// checks that the pair integrates polynomials of degree 22 (Kronrod) and 13 (Gauss) exactly.
export const KRONROD_NODES = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0,
];
export const KRONROD_WEIGHTS = [
  0.022935322010529224963732008058970, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.169004726639267902826583426598550, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
];
export const GAUSS_WEIGHTS = [
  0.129484966168869693270611432679082, 0.279705391489276667901467771423780, 0.381830050505118944950369775488975,
  0.417959183673469387755102040816327,
];

interface Piece {
  a: number;
  b: number;
  value: number;
  error: number;
}

/** Kronrod estimate and |Kronrod - Gauss| on [a, b]. */
export function gaussKronrod(f: (x: number) => number, a: number, b: number): { value: number; error: number } {
  const c = (a + b) / 2;
  const h = (b - a) / 2;
  const fc = f(c);
  let kronrod = fc * KRONROD_WEIGHTS[7];
  let gauss = fc * GAUSS_WEIGHTS[3];
  for (let i = 0; i < 7; i++) {
    const dx = h * KRONROD_NODES[i];
    const pair = f(c - dx) + f(c + dx);
    kronrod += KRONROD_WEIGHTS[i] * pair;
    if (i % 2 === 1) gauss += GAUSS_WEIGHTS[(i - 1) / 2] * pair;
  }
  return { value: kronrod * h, error: Math.abs((kronrod - gauss) * h) };
}

/**
 * Global adaptive integration over consecutive breakpoints: always bisect the piece with the
 * largest error estimate until the summed |K15 - G7| is below relTol of the total. |K15 - G7|
 * bounds the error of G7; the K15 value returned is typically far more accurate than that.
 */
export function integrate(f: (x: number) => number, points: number[], relTol: number, maxPieces = 2000): number {
  const pieces: Piece[] = [];
  for (let i = 0; i + 1 < points.length; i++) {
    if (points[i + 1] > points[i]) pieces.push({ a: points[i], b: points[i + 1], ...gaussKronrod(f, points[i], points[i + 1]) });
  }
  for (;;) {
    let total = 0;
    let error = 0;
    let worst = 0;
    for (let i = 0; i < pieces.length; i++) {
      total += pieces[i].value;
      error += pieces[i].error;
      if (pieces[i].error > pieces[worst].error) worst = i;
    }
    if (error <= relTol * Math.abs(total) || error === 0 || pieces.length >= maxPieces) return total;
    const { a, b } = pieces[worst];
    const m = (a + b) / 2;
    pieces.splice(worst, 1, { a, b: m, ...gaussKronrod(f, a, m) }, { a: m, b, ...gaussKronrod(f, m, b) });
  }
}
