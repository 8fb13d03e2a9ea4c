import cliProgress from "cli-progress";
import type { SamplerProgress } from "../inference/index.js";
import type { CliIo } from "./cli-io.js";

/** A progress bar on stderr fed by the sampler's progress callback; silent unless stderr is a terminal. */
export interface SamplerProgressBar {
  readonly onProgress?: (progress: SamplerProgress) => void;
  stop(): void;
}

/**
 * Draws a bar (cli-progress) for a run that may take more than a second: the sampler's fraction done, its
 * phase and the log-likelihood evaluations so far. Nothing is drawn with --quiet or when stderr is not a
 * terminal (logs and pipes stay clean).
 */
export function samplerProgressBar(io: CliIo, quiet: boolean, label: string): SamplerProgressBar {
  if (quiet || !io.stderrIsTty) return { stop: () => undefined };
  const bar = new cliProgress.SingleBar(
    { format: `${label} [{bar}] {percentage}% | {phase} | {evaluations} evaluations | {duration}s`, hideCursor: true, stream: process.stderr },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  return {
    onProgress: (progress) => {
      const payload = { phase: progress.phase, evaluations: Math.round(progress.likelihoodEvaluations) };
      if (!started) {
        bar.start(100, 0, payload);
        started = true;
      }
      bar.update(Math.round(100 * progress.fraction), payload);
    },
    stop: () => {
      if (started) bar.stop();
    },
  };
}
