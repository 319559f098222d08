import type { CommandIO } from './output.js';

/** A progress line on a terminal: updated in place, erased at the end. */
export interface ProgressLine {
  /** Shows `done` of `total` with the rate and the time left (at most ten redraws a second). */
  update(done: number, total: number): void;
  /** Erases the line. */
  end(): void;
}

/**
 * A progress line for long work, written to stderr only while stderr is a terminal (never into a
 * pipe, a file or a CI log); a few lines of our own rather than a dependency, since all it needs
 * is a carriage return and an erase-line code.
 *
 * @param io - the command's output sinks (`stderrIsTTY` decides)
 * @param what - what is counted, e.g. `fault classes`
 * @param enabled - false turns it off (e.g. with `--json`)
 * @returns the line
 * @example
 * ```ts
 * const p = progressLine(io, 'fault classes', !json); p.update(3, 10); p.end();
 * ```
 */
export function progressLine(io: CommandIO, what: string, enabled = true): ProgressLine {
  const on = enabled && io.stderrIsTTY === true;
  const t0 = Date.now();
  let last = 0;
  let shown = false;
  return {
    update(done, total) {
      if (!on) return;
      const now = Date.now();
      if (done < total && now - last < 100) return;
      last = now;
      const s = (now - t0) / 1000;
      const rate = s > 0 ? done / s : 0;
      const left = rate > 0 ? Math.ceil((total - done) / rate) : null;
      io.stderr(`\r\x1b[2K${done}/${total} ${what}, ${rate.toFixed(1)}/s${left === null ? '' : `, about ${left} s left`}`);
      shown = true;
    },
    end() {
      if (on && shown) io.stderr('\r\x1b[2K');
    },
  };
}
