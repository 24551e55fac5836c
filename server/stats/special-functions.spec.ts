import { describe, expect, it } from 'vitest';
import { incompleteBeta, incompleteGamma, lbeta, lgamma, log1pmx } from './special-functions';

function relErr(x: number, ref: number): number {
  return Math.abs(x - ref) / Math.abs(ref);
}

/** ln((n-1)!) by summing logs of integers: each term is correctly rounded, so the sum is good to ~n ulps. */
function lnFactorialOfPredecessor(n: number): number {
  let s = 0;
  for (let k = 2; k < n; k++) s += Math.log(k);
  return s;
}

describe('lgamma / lbeta', () => {
  it('matches ln((n-1)!) for integers', () => {
    // Γ(n) = (n-1)! (textbook identity)
    for (const n of [3, 7, 12, 30, 171]) expect(relErr(lgamma(n), lnFactorialOfPredecessor(n))).toBeLessThan(1e-14);
    expect(Math.abs(lgamma(1))).toBeLessThan(5e-15);
    expect(Math.abs(lgamma(2))).toBeLessThan(5e-15);
  });

  it('matches ln sqrt(pi) at 1/2', () => {
    // Γ(1/2) = sqrt(pi) (textbook identity)
    expect(relErr(lgamma(0.5), 0.5 * Math.log(Math.PI))).toBeLessThan(1e-14);
  });

  it('lbeta agrees with the three-lgamma form where that form is safe', () => {
    // B(a, b) = Γ(a)Γ(b)/Γ(a+b) (definition); B(1, b) = 1/b (closed form)
    expect(relErr(lbeta(3.5, 40), lgamma(3.5) + lgamma(40) - lgamma(43.5))).toBeLessThan(1e-13);
    expect(relErr(lbeta(12, 15), lgamma(12) + lgamma(15) - lgamma(27))).toBeLessThan(1e-13);
    expect(relErr(lbeta(1, 9000), -Math.log(9000))).toBeLessThan(1e-14);
  });

  it('log1pmx is accurate near 0', () => {
    // series log(1+t) - t = -t^2/2 + t^3/3 - t^4/4 + ... (textbook); at t = 1e-6 three terms suffice
    const t = 1e-6;
    expect(relErr(log1pmx(t), -(t * t) / 2 + (t * t * t) / 3 - (t * t * t * t) / 4)).toBeLessThan(1e-15);
    // and log1p(t) - t itself, where the cancellation is mild (t = 0.5)
    expect(relErr(log1pmx(0.5), Math.log(1.5) - 0.5)).toBeLessThan(1e-14);
  });
});

describe('incompleteBeta', () => {
  it('matches the closed forms I_x(1, b) = 1 - (1-x)^b and I_x(a, 1) = x^a', () => {
    // closed forms from the definition of the regularised incomplete beta (textbook); x^200 ~ 1e-260
    // has an exponent of -599, whose rounding alone is ~1e-13 relative, hence 1e-12
    for (const [x, s] of [
      [0.3, 4],
      [0.05, 200],
      [0.9, 0.5],
    ]) {
      expect(relErr(incompleteBeta(x, 1, s).upper, (1 - x) ** s)).toBeLessThan(1e-12);
      expect(relErr(incompleteBeta(x, s, 1).lower, x ** s)).toBeLessThan(1e-12);
    }
  });

  it('is symmetric: I_x(a, b) = 1 - I_{1-x}(b, a), and 1/2 at the centre of a symmetric beta', () => {
    // symmetry of the beta distribution (textbook); ~400 continued-fraction steps at a = 9000 leave
    // a rounding error of order 1e-14, hence the tolerance
    expect(Math.abs(incompleteBeta(0.5, 9000, 9000).lower - 0.5)).toBeLessThan(5e-14);
    const p = incompleteBeta(0.37, 12.5, 31);
    const q = incompleteBeta(0.63, 31, 12.5);
    expect(relErr(p.lower, q.upper)).toBeLessThan(1e-13);
  });

  it('rejects shapes <= 0 naming the value', () => {
    expect(() => incompleteBeta(0.5, -1, 2)).toThrow(/a=-1/);
  });
});

describe('incompleteGamma', () => {
  it('matches Q(n, x) = e^-x sum_{k<n} x^k/k! for integer n, including deep tails', () => {
    // Poisson-sum identity for integer shape (textbook)
    for (const [n, x] of [
      [1, 0.5],
      [3, 2],
      [5, 30],
      [20, 3],
      [50, 200],
    ]) {
      let term = Math.exp(-x);
      let sum = term;
      for (let k = 1; k < n; k++) {
        term *= x / k;
        sum += term;
      }
      expect(relErr(incompleteGamma(n, x).upper, sum)).toBeLessThan(1e-12);
    }
  });

  it('rejects a negative x naming the value', () => {
    expect(() => incompleteGamma(2, -3)).toThrow(/got -3/);
  });
});
