/**
 * Accretion outbursts: steps in which the accretion rate onto the star exceeds `factor` times its mean over
 * the preceding `window` (10 x over 10^4 yr by default: FU Orionis-type events raise Ṁ_* 100-1000-fold within
 * years, far above that; common practice, e.g. Audard et al. 2014 for the observed rises, from memory).
 * An outburst is a run of consecutive such steps; the tracker counts them, adds up the mass the star
 * accretes during them, and keeps the start of the first. Detection begins once a full window has passed.
 * The mean is (M_acc(t) − M_acc(t − window))/window, with M_acc interpolated linearly between steps.
 */
export interface OutburstSummary {
  count: number;
  /** Mass accreted during outbursts, g. */
  mass: number;
  /** Start of the first outburst, s (null if none). */
  firstStart: number | null;
}

/** Samples behind the window kept before they are dropped in one go (amortises the splice). */
const DROP_AFTER = 4096;

export class OutburstTracker {
  private readonly times: number[] = [0];
  private readonly masses: number[] = [0];
  private cursor = 0;
  private inOutburst = false;
  private readonly summary: OutburstSummary = { count: 0, mass: 0, firstStart: null };

  constructor(private readonly window: number, private readonly factor: number) {}

  /** After each step ending at t: `massToStar` is the total accreted so far (g), `mdot` the step's rate (g/s). */
  observe(t: number, massToStar: number, mdot: number): void {
    const tStart = this.times[this.times.length - 1];
    this.times.push(t);
    this.masses.push(massToStar);
    const from = t - this.window;
    if (from < 0) return;
    while (this.cursor + 1 < this.times.length && this.times[this.cursor + 1] <= from) this.cursor++;
    if (this.cursor >= DROP_AFTER) {
      // Samples before the cursor are never read again (the window only moves forward): drop them, so a run of
      // a million steps keeps one window of history instead of every step.
      this.times.splice(0, this.cursor);
      this.masses.splice(0, this.cursor);
      this.cursor = 0;
    }
    const t0 = this.times[this.cursor];
    const t1 = this.times[this.cursor + 1];
    const m0 = this.masses[this.cursor];
    const m1 = this.masses[this.cursor + 1];
    const massThen = t1 > t0 ? m0 + ((m1 - m0) * (from - t0)) / (t1 - t0) : m0;
    const mean = (massToStar - massThen) / this.window;
    const bursting = mean > 0 && mdot > this.factor * mean;
    if (bursting) {
      if (!this.inOutburst) {
        this.summary.count++;
        if (this.summary.firstStart === null) this.summary.firstStart = tStart;
      }
      this.summary.mass += mdot * (t - tStart);
    }
    this.inOutburst = bursting;
  }

  result(): OutburstSummary {
    return { ...this.summary };
  }
}
