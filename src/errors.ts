/**
 * Errors raised at boundaries (spec, data files, run directories, CLI options).
 * The CLI prints `message` as one line and exits with code 2.
 * @module
 */

/** Where in an input a problem was found. */
export interface InputLocation {
  /** File path as given by the user, if the input is a file. */
  readonly file?: string;
  /** 1-based line number, if known. */
  readonly line?: number;
  /** Column, key or option name. */
  readonly field?: string;
}

/**
 * Bad user input. The message already names the file, line and field, what was
 * found and what was expected.
 */
export class InputError extends RangeError {
  readonly location: InputLocation;
  constructor(message: string, location: InputLocation = {}) {
    super(formatLocation(location) + message);
    this.name = "InputError";
    this.location = location;
  }
}

function formatLocation(loc: InputLocation): string {
  const parts: string[] = [];
  if (loc.file !== undefined) {
    parts.push(loc.line === undefined ? loc.file : `${loc.file}:${loc.line}`);
  }
  if (loc.field !== undefined) parts.push(loc.field);
  return parts.length === 0 ? "" : parts.join(": ") + ": ";
}
