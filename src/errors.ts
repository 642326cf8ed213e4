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

/** The text of any error as the command line prints it; an error famwise did not expect asks to be reported. */
export function errorText(error: unknown): string {
  if (error instanceof FamwiseError) return error.message;
  const message = error instanceof Error ? error.message : String(error);
  // System errors (a full disk, a missing permission) carry a code and explain themselves.
  return (error as NodeJS.ErrnoException | undefined)?.code ? message : `unexpected error (please report it): ${message}`;
}

/**
 * A failure after part of the table went where it cannot be taken back
 * (standard output, a pipe): the reader must not mistake it for the whole.
 */
export class IncompleteOutputError extends FamwiseError {
  constructor(cause: unknown, where: string) {
    super(`${errorText(cause)}; the table written to ${where} is incomplete`, cause instanceof FamwiseError ? cause.exitCode : EXIT.dataError);
  }
}

/** Text from a table, quoted for a message and shortened if long. */
export function quoteText(text: string, limit = 60): string {
  const shown = text.length > limit ? `${text.slice(0, limit)}...` : text;
  return JSON.stringify(shown);
}
