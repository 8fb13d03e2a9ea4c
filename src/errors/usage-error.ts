/**
 * A mistake in how Horologium was called rather than in the data: an unknown or malformed command-line
 * option, a missing argument, a catalogue or journal that does not fit the run asked for. The command line
 * prints `message` as one line on stderr and exits 2, with no stack trace (docs/architecture.md, "Errors").
 *
 * It lives on the ground floor (`src/errors/`, beside {@link InputError}) so that any layer, the batch
 * runner included, can raise it without importing the command line.
 *
 * @example throw new UsageError("--seed must be a non-negative integer, got '-3'");
 */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UsageError";
  }
}
