// Exit statuses, the one list the CLI, the README and --help draw on.
export const EXIT = {
  ok: 0,
  /** The table is unreadable or holds a value famwise cannot accept. */
  dataError: 1,
  /** The command line is wrong: an unknown option, a bad value, a column that is not there. */
  usageError: 2,
  /** famwise audit: the claimed adjusted values do not match the recomputed ones. */
  mismatch: 3,
} as const;

export const EXIT_HELP = [
  `${EXIT.ok}  success`,
  `${EXIT.dataError}  invalid data (the message names the file, line, column and text)`,
  `${EXIT.usageError}  invalid usage (an option, its value, or a column name)`,
].join('\n');

export const AUDIT_EXIT_HELP = `${EXIT_HELP}\n${EXIT.mismatch}  the claimed adjusted values do not match (famwise audit)`;
