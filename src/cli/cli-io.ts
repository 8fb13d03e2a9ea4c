/**
 * What a command-line verb may touch of the outside world: its output streams, the environment and a clock.
 * Passing these in (rather than reading process globals) keeps the verbs testable in-process.
 */
export interface CliIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  /** Whether stderr is an interactive terminal (progress bars are drawn only then, and never with --quiet). */
  readonly stderrIsTty: boolean;
  readonly env: Readonly<Record<string, string | undefined>>;
  readonly cwd: string;
  /** Wall-clock milliseconds, for timings and progress rates. */
  readonly now: () => number;
}

/** A verb of the `horologium` command: parses its own arguments and returns the process exit code. */
export interface CliVerb {
  /** One line for the top-level help. */
  readonly summary: string;
  run(args: string[], io: CliIo): Promise<number>;
}
