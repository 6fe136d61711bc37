/**
 * A rejected input: a stable code, a message, and where it is (file, 1-based line and column).
 * Whole-file problems use line 0, column 0 (e.g. a file that cannot be read or is not UTF-8 past
 * its first line is reported at the line of the first bad byte); header problems use the header's
 * line and the column of the offending header cell (0 when the column is absent).
 *
 * `not_stored` is the database refusing one test that passed every check here (the batch writer
 * isolates it and stores the rest); its message is the database's.
 */

export const REJECTION_CODES = [
  'missing_column',
  'missing_value',
  'not_a_number',
  'not_finite',
  'nonpositive_dimension',
  'nonpositive_value',
  'unknown_unit',
  'unknown_shape',
  'unknown_yield_definition',
  'invalid_date',
  'missing_curve_file',
  'path_escapes_folder',
  'curve_too_short',
  'missing_channel',
  'time_not_monotonic',
  'not_utf8',
  'conflict',
  'bad_column_map',
  'unreadable_file',
  'malformed_csv',
  'wrong_cell_count',
  'out_of_range',
  'value_too_long',
  'invalid_text',
  'not_stored',
] as const;

export type RejectionCode = (typeof REJECTION_CODES)[number];

export interface Rejection {
  file: string;
  line: number;
  column: number;
  code: RejectionCode;
  message: string;
}

/** messages are cut to this many characters (a parser's message can quote a whole 2 MB field) */
const MAX_MESSAGE = 400;

export function reject(file: string, line: number, column: number, code: RejectionCode, message: string): Rejection {
  return { file, line, column, code, message: message.length > MAX_MESSAGE ? message.slice(0, MAX_MESSAGE - 1) + '…' : message };
}

/** `file:line:column: code: message`, the form printed by the command line. */
export function formatRejection(r: Rejection): string {
  return `${r.file}:${r.line}:${r.column}: ${r.code}: ${r.message}`;
}

/** Thrown (as a value with a code and location) where a reader cannot go on. */
export class RejectionError extends Error {
  constructor(readonly rejection: Rejection) {
    super(formatRejection(rejection));
  }
}
