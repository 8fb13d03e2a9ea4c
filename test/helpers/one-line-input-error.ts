import { expect } from "vitest";
import { InputError } from "../../src/errors/input-error.js";

/**
 * What every reader test asks of bad input (the project's rule, docs/architecture.md "Errors"): `run`
 * throws an InputError whose message is one line. Returns the error, for the test to check its file, line
 * and column; fails the test when `run` does not throw or throws something else.
 */
export function oneLineInputError(run: () => unknown): InputError {
  try {
    run();
  } catch (error) {
    return checkedInputError(error);
  }
  throw new Error("expected an InputError");
}

/** {@link oneLineInputError} for a reader that returns a promise. */
export async function oneLineInputErrorAsync(run: () => Promise<unknown>): Promise<InputError> {
  try {
    await run();
  } catch (error) {
    return checkedInputError(error);
  }
  throw new Error("expected an InputError");
}

function checkedInputError(error: unknown): InputError {
  expect(error).toBeInstanceOf(InputError);
  expect((error as Error).message).not.toContain("\n");
  return error as InputError;
}
