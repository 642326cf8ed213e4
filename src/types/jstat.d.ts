// The part of jstat (which ships no types) that famwise and its tests use.
declare module 'jstat' {
  export interface Distribution {
    cdf(x: number, ...parameters: number[]): number;
  }
  export interface JStat {
    /** log Gamma(x) for x > 0 (Zhang & Jin's algorithm; accurate to about 1e-15 relative). */
    loggam(x: number): number;
    normal: Distribution;
    chisquare: Distribution;
  }
  const jStat: JStat;
  export default jStat;
}
