// jstat ships no type declarations; the tests use only these functions, as an independent reference.
declare module 'jstat' {
  interface ContinuousDistribution {
    cdf(x: number, ...parameters: number[]): number;
    inv(p: number, ...parameters: number[]): number;
    pdf(x: number, ...parameters: number[]): number;
  }
  interface DiscreteDistribution {
    cdf(k: number, ...parameters: number[]): number;
    pdf(k: number, ...parameters: number[]): number;
  }
  const jStat: {
    gammaln(x: number): number;
    gammap(a: number, x: number): number;
    lowRegGamma(a: number, x: number): number;
    gammapinv(p: number, a: number): number;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
    normal: ContinuousDistribution;
    chisquare: ContinuousDistribution;
    beta: ContinuousDistribution;
    poisson: DiscreteDistribution;
    binomial: DiscreteDistribution;
  };
  export default jStat;
}
