/**
 * Progress bar for long command-line work, drawn on stderr with cli-progress. Shown only when
 * stderr is a terminal and the output is not machine-readable (--json / --csv), so pipes and
 * scripts see nothing.
 */
import cliProgress from 'cli-progress';

export interface Progress {
  /** Reports `done` of `total` units; `detail` (optional) is shown after the time ("leg 1/2 · 85 flights"). */
  update(done: number, total: number, detail?: string): void;
  /** Removes the bar (safe to call more than once). */
  stop(): void;
}

/** Whether a bar should be drawn: not for machine-readable output, and only on a terminal. */
export function progressEnabled(machineReadable: boolean, stream: { isTTY?: boolean } = process.stderr): boolean {
  return !machineReadable && stream.isTTY === true;
}

const SILENT: Progress = { update() {}, stop() {} };

/** A bar labelled `label` counting `unit`s, or a silent stand-in when `enabled` is false. */
export function createProgress(label: string, unit: string, enabled: boolean): Progress {
  if (!enabled) return SILENT;
  const bar = new cliProgress.SingleBar(
    {
      stream: process.stderr,
      format: `${label} [{bar}] {percentage}% | {value}/{total} ${unit} | {duration_formatted}{detail}`,
      hideCursor: true,
      clearOnComplete: true,
      fps: 10,
    },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  let stopped = false;
  return {
    update(done, total, detail) {
      if (stopped) return;
      const payload = { detail: detail ? ` | ${detail}` : '' };
      if (!started) {
        bar.start(total, done, payload);
        started = true;
      } else {
        bar.setTotal(total);
        bar.update(done, payload);
      }
    },
    stop() {
      if (started && !stopped) bar.stop();
      stopped = true;
    },
  };
}
