import { InputError } from "./input-error.js";

/**
 * An {@link InputError} for a table whose time or value column has none of the recognised names. It
 * carries the table's column names so that an interface can ask the user which column is which (the
 * browser page does) instead of only printing the message.
 */
export class UnrecognisedColumnError extends InputError {
  /** "time" or "value". */
  readonly role: string;
  /** The column names of the table, in file order. */
  readonly columns: readonly string[];

  constructor(problem: string, where: { file?: string }, role: string, columns: readonly string[]) {
    super(problem, where);
    this.name = "UnrecognisedColumnError";
    this.role = role;
    this.columns = [...columns];
  }
}
