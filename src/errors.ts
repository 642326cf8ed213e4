// Errors that carry their exit status, so that the CLI needs no guessing:
// a DataError is about the table, a UsageError about the command line.

import { EXIT } from './exit-codes.js';

export class FamwiseError extends Error {
  constructor(
    message: string,
    readonly exitCode: number,
  ) {
    super(message);
  }
}

export class DataError extends FamwiseError {
  constructor(message: string) {
    super(message, EXIT.dataError);
  }
}

export class UsageError extends FamwiseError {
  constructor(message: string) {
    super(message, EXIT.usageError);
  }
}

/** Text from a table, quoted for a message and shortened if long. */
export function quoteText(text: string, limit = 60): string {
  const shown = text.length > limit ? `${text.slice(0, limit)}...` : text;
  return JSON.stringify(shown);
}
