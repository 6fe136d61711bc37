/**
 * Errors of the store that a user can act on (a busy, read-only or missing database folder, a
 * server that cannot be reached): a stable code and a plain message, printed without a stack.
 * The command line exits 4 for `database_busy` (another process holds the embedded folder; try
 * again later), 1 for the others.
 */

export type StoreErrorCode = 'database_busy' | 'database_read_only' | 'database_unavailable' | 'not_a_database';

export class StoreError extends Error {
  constructor(
    readonly code: StoreErrorCode,
    message: string,
    options?: { cause?: unknown },
  ) {
    super(message, options);
    this.name = 'StoreError';
  }
}
