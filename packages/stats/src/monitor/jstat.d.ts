// The part of jstat (no type declarations of its own) that the monitor uses: the studentized
// range distribution, a port of R's ptukey/qtukey (Copenhaver & Holland 1988 algorithm).
declare module 'jstat' {
  interface Tukey {
    /** P(Q ≤ q) for the range of `nmeans` normal means with `df` degrees of freedom (df ≥ 2). */
    cdf(q: number, nmeans: number, df: number): number;
    /** The p-quantile of the same distribution. */
    inv(p: number, nmeans: number, df: number): number;
  }
  const jstat: { jStat: { tukey: Tukey } };
  export default jstat;
}
