// jstat ships no types; only the parts the engine uses are declared here.
declare module 'jstat' {
  interface ContinuousDistribution {
    cdf(x: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
  }
  interface JStatStatic {
    centralF: ContinuousDistribution;
    studentt: ContinuousDistribution;
    chisquare: ContinuousDistribution;
    normal: ContinuousDistribution;
    beta: ContinuousDistribution;
    gammaln(x: number): number;
    betafn(a: number, b: number): number;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
    gammap(a: number, x: number): number;
    gammapinv(p: number, a: number): number;
    lowRegGamma(a: number, x: number): number;
    tukey: { cdf(q: number, nmeans: number, df: number): number; inv(p: number, nmeans: number, df: number): number };
    [key: string]: unknown;
  }
  const pkg: { jStat: JStatStatic };
  export default pkg;
}
