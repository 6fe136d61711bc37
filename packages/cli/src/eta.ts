/**
 * A steady estimate of the time left for a progress display. The rate is the slope of work done
 * over time since a short warm-up, smoothed exponentially (time constant `tauSeconds`) so that a
 * burst of batches finishing together does not swing it; the estimate is shown only once
 * `minSeconds` have passed and `minShare` of the work is done, and the shown value moves toward a
 * new estimate by at most half the difference per update unless the new one is far off (more
 * than 50 %), so it neither jumps nor sticks. Times in seconds; the clock is passed in.
 * Hand-written: progress libraries estimate from the last few updates, which is what jumps.
 */
export interface EtaOptions {
  tauSeconds?: number;
  minSeconds?: number;
  minShare?: number;
}

export class EtaEstimator {
  private t0: number | null = null;
  private d0 = 0;
  private lastT = 0;
  private lastD = 0;
  private rate: number | null = null;
  private shown: number | null = null;
  private readonly tau: number;
  private readonly minSeconds: number;
  private readonly minShare: number;

  constructor(opts: EtaOptions = {}) {
    this.tau = opts.tauSeconds ?? 8;
    this.minSeconds = opts.minSeconds ?? 2;
    this.minShare = opts.minShare ?? 0.02;
  }

  /** Records `done` of `total` at time `t` [s]; returns the seconds left, or null while unknown. */
  update(t: number, done: number, total: number): number | null {
    if (this.t0 === null) {
      this.t0 = this.lastT = t;
      this.d0 = this.lastD = done;
      return null;
    }
    const dt = t - this.lastT;
    if (dt > 0 && done >= this.lastD) {
      const inst = (done - this.lastD) / dt;
      const w = 1 - Math.exp(-dt / this.tau);
      const overall = (done - this.d0) / (t - this.t0);
      // the overall rate anchors the smoothed one, so long pauses and bursts even out
      this.rate = this.rate === null ? overall : (1 - w) * this.rate + w * (0.5 * inst + 0.5 * overall);
      this.lastT = t;
      this.lastD = done;
    }
    if (done >= total) return (this.shown = 0);
    if (t - this.t0 < this.minSeconds || done / total < this.minShare || !this.rate || this.rate <= 0) return null;
    const estimate = (total - done) / this.rate;
    if (this.shown === null || Math.abs(estimate - this.shown) > 0.5 * Math.max(this.shown, 1)) this.shown = estimate;
    else this.shown = Math.max(0, this.shown - dt + 0.5 * (estimate - (this.shown - dt)));
    return this.shown;
  }
}

/** "about 1 min 20 s left", "about 8 s left", "less than a second left". */
export function formatEta(seconds: number | null): string {
  if (seconds === null) return 'estimating time left';
  if (seconds < 1) return 'less than a second left';
  const s = Math.round(seconds);
  if (s < 60) return `about ${s} s left`;
  const m = Math.floor(s / 60);
  return `about ${m} min ${String(s % 60).padStart(2, '0')} s left`;
}
