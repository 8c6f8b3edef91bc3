// One error vocabulary for route handlers and server actions: a code, a safe message,
// optional per-field messages. Never a stack trace to the client. No zod here: client
// components import this module; mapping a zod failure is lib/error-body.ts's (server side).

export const ERROR_STATUS = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  length_required: 411,
  too_large: 413,
  unsupported_media_type: 415,
  invalid: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;
export type FieldErrors = Record<string, string[]>;
export type ErrorBody = { error: { code: ErrorCode; message: string; fields?: FieldErrors } };

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export const DATABASE_UNAVAILABLE_MESSAGE = "The shop's records are briefly unavailable. Try again in a few seconds.";

// Connection-level failures of the database driver (mysql2) and of knex's pool, told apart by
// their code, errno or name only, so this module stays free of server-only imports. Socket codes
// count only on an error mysql2 marked `fatal` (its connection is gone), so a failed call to
// another service (fetch's ECONNREFUSED) is not taken for the database.
const SOCKET_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EHOSTUNREACH", "ENETUNREACH", "ENOTFOUND", "EAI_AGAIN", "EPIPE", "ECONNABORTED"]);
const DRIVER_CODES = new Set([
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR",
  "ER_CON_COUNT_ERROR",
  "ER_TOO_MANY_USER_CONNECTIONS",
  "ER_SERVER_SHUTDOWN",
  "ER_NET_READ_ERROR",
  "ER_NET_READ_INTERRUPTED",
  "ER_NET_ERROR_ON_WRITE",
  "ER_NET_WRITE_INTERRUPTED",
]);
// Too many connections, shutdown in progress, too many for this user, connection killed (MariaDB);
// the C client's can't connect / server gone away / lost connection; a Galera node not yet synced
// (1047, "WSREP has not yet prepared node for application use"); and a deadlock or lock wait that
// db/transaction.ts already retried and that still failed (1213, 1205: on Galera also a lost
// certification) — busy, not broken, so a 503 the caller may retry rather than a 500.
const SERVER_ERRNOS = new Set([1040, 1047, 1053, 1203, 1205, 1213, 1927, 2002, 2003, 2006, 2013]);

/** True when the database can't be reached right now (down, restarting, out of connections): a 503, not a 500. */
export function isDatabaseUnavailable(error: unknown, depth = 0): boolean {
  if (typeof error !== "object" || error === null) return false;
  const e = error as { code?: unknown; errno?: unknown; name?: unknown; fatal?: unknown; cause?: unknown };
  const code = typeof e.code === "string" ? e.code : undefined;
  if (e.name === "KnexTimeoutError") return true; // no free connection within acquireConnectionTimeout
  if (code && DRIVER_CODES.has(code)) return true;
  if (typeof e.errno === "number" && SERVER_ERRNOS.has(e.errno)) return true;
  // "Can't add new command when connection is in closed state" is fatal and has no code.
  if (e.fatal === true && (code === undefined || SOCKET_CODES.has(code))) return true;
  return depth < 2 && e.cause !== undefined && isDatabaseUnavailable(e.cause, depth + 1);
}
