// Minimal typing for the parts of jStat (dev dependency, no bundled types) that the cross-check uses.
declare module 'jstat' {
  interface Distribution {
    cdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
  }
  const jStat: {
    normal: Distribution;
    chisquare: Distribution;
    gammaln(x: number): number;
    lowRegGamma(a: number, x: number): number;
  };
  export default jStat;
}
