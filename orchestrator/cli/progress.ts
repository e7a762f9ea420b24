/**
 * Progress of a long sweep on stderr: done / failed / total, rate and ETA. On a terminal it rewrites one
 * line; otherwise (a log file, CI) it prints a plain line every few seconds. The rate is an exponential moving
 * average over recent commits, so the ETA follows the current speed; it shows "ETA —" until it knows one.
 */
export interface ProgressCounts {
  /** Points with a result, failed ones included. */
  readonly done: number;
  /** Of those, the ones whose status is not ok. */
  readonly failed: number;
  readonly total: number;
}

const HALF_LIFE_S = 20;
const PLAIN_EVERY_MS = 5_000;

export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return '—';
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  return h > 0 ? `${h}h${String(m).padStart(2, '0')}m` : m > 0 ? `${m}m${String(s % 60).padStart(2, '0')}s` : `${s}s`;
}

export class ProgressReporter {
  private rate = NaN; // points per second
  private lastTime: number;
  private lastDone: number;
  private lastPrint = 0;
  private readonly started: number;

  constructor(
    private readonly stream: NodeJS.WriteStream,
    private readonly label: string,
    initialDone: number,
    private readonly now: () => number = () => performance.now(),
  ) {
    this.started = this.now();
    this.lastTime = this.started;
    this.lastDone = initialDone;
  }

  update(c: ProgressCounts, force = false): void {
    const t = this.now();
    const dt = (t - this.lastTime) / 1000;
    const finished = c.done;
    if (dt > 0 && finished > this.lastDone) {
      const instant = (finished - this.lastDone) / dt;
      const w = 1 - 0.5 ** (dt / HALF_LIFE_S);
      this.rate = Number.isNaN(this.rate) ? instant : this.rate + w * (instant - this.rate);
      this.lastTime = t;
      this.lastDone = finished;
    }
    const knows = !Number.isNaN(this.rate) && t - this.started > 2000;
    const eta = knows ? formatDuration((c.total - finished) / this.rate) : '—';
    const pct = c.total > 0 ? ((100 * finished) / c.total).toFixed(1) : '100.0';
    const rate = knows ? `${this.rate >= 10 ? this.rate.toFixed(0) : this.rate.toPrecision(2)} points/s` : 'rate —';
    const line = `${this.label}: ${c.done}/${c.total} done (${pct}%), ${c.failed} failed, ${rate}, ETA ${eta}`;
    if (this.stream.isTTY === true) {
      this.stream.write(`\r${line}\x1b[K`);
    } else if (force || t - this.lastPrint >= PLAIN_EVERY_MS) {
      this.stream.write(`${line}\n`);
      this.lastPrint = t;
    }
  }

  /** End the line (terminal) so what follows starts on its own line. */
  end(c: ProgressCounts): void {
    this.update(c, true);
    if (this.stream.isTTY === true) this.stream.write('\n');
  }
}
