import cliProgress from "cli-progress";
import type { BatchProgress } from "./batch-run.js";
import { formatDuration, formatRate, throughput } from "./throughput.js";

/** Shows a batch run's progress; see {@link progressDisplay}. */
export interface ProgressDisplay {
  update(progress: BatchProgress): void;
  stop(): void;
}

/** Where progress goes: the text sink of stderr, whether it is a terminal, its width and a clock. */
export interface ProgressTarget {
  readonly write: (text: string) => void;
  readonly isTerminal: boolean;
  readonly columns?: number;
  readonly now: () => number;
  /** Milliseconds between status lines when stderr is not a terminal (default 30 s). */
  readonly lineIntervalMs?: number;
}

/** The tokens of a status line; named so as not to clash with cli-progress's own ({eta}, {value}, ...). */
function statusText(progress: BatchProgress): { counts: string; rate: string; remaining: string } {
  const { rate, etaSeconds } = throughput(progress.recorded, progress.toDo, progress.elapsedMs);
  const total = progress.toDo === undefined ? "" : `/${progress.toDo}`;
  return {
    counts: `${progress.recorded}${total} done, ${progress.failed} failed`,
    rate: formatRate(rate),
    remaining: `ETA ${formatDuration(etaSeconds)}`,
  };
}

/**
 * On a terminal, a progress bar (cli-progress) with counts, the fit rate and the time left; otherwise
 * (a Slurm log, a pipe) one status line at most every `lineIntervalMs`, so that logs stay short.
 */
export function progressDisplay(target: ProgressTarget): ProgressDisplay {
  if (!target.isTerminal) {
    const interval = target.lineIntervalMs ?? 30_000;
    let last = target.now();
    return {
      update(progress) {
        const now = target.now();
        if (now - last < interval) return;
        last = now;
        const text = statusText(progress);
        target.write(`batch: ${text.counts}, ${text.rate}, ${text.remaining}\n`);
      },
      stop() {},
    };
  }
  const stream = {
    isTTY: true,
    columns: target.columns ?? 80,
    write: (text: string) => {
      target.write(text);
      return true;
    },
  } as unknown as NodeJS.WritableStream;
  const bar = new cliProgress.SingleBar(
    {
      stream,
      format: "[{bar}] {counts} | {rate} | {remaining}",
      barsize: 16,
      hideCursor: null,
      clearOnComplete: false,
      fps: 5,
    },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  return {
    update(progress) {
      const text = statusText(progress);
      const total = progress.toDo ?? Math.max(progress.recorded, 1);
      if (!started) {
        bar.start(total, progress.recorded, text);
        started = true;
      } else {
        bar.setTotal(total);
        bar.update(progress.recorded, text);
      }
    },
    stop() {
      if (started) bar.stop();
    },
  };
}
