// One error type for expected failures; codes map to HTTP statuses. Detail from the database is
// logged on the server and never sent to the client.
export type ErrorCode = "unauthenticated" | "forbidden" | "not-found" | "invalid" | "conflict" | "locked" | "too-large" | "unavailable";

export const STATUS: Record<ErrorCode, number> = {
  unauthenticated: 401,
  forbidden: 403,
  "not-found": 404,
  invalid: 422,
  conflict: 409,
  locked: 423,
  "too-large": 413,
  unavailable: 503,
};

export class AppError extends Error {
  constructor(
    public code: ErrorCode,
    message: string,
    public fieldErrors?: Record<string, string[]>,
  ) {
    super(message);
    this.name = "AppError";
  }
}

/** A PostgreSQL error's SQLSTATE and constraint, whether thrown by pg or wrapped by Drizzle (as its cause). */
export function pgErrorOf(err: unknown): { code?: string; constraint?: string } {
  const e = err as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } } | null | undefined;
  return { code: e?.code ?? e?.cause?.code, constraint: e?.constraint ?? e?.cause?.constraint };
}

/** Turn anything thrown into an AppError safe to show; unexpected errors are logged. */
export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  const e = err as { code?: string; message?: string; cause?: { code?: string } };
  if ((err as Error)?.name === "StorageUnavailableError") {
    return new AppError("unavailable", "Photo storage is not reachable right now. Nothing was recorded; try the upload again in a moment.");
  }
  const pgCode = pgErrorOf(err).code;
  if (pgCode === "23505") return new AppError("conflict", "That already exists.");
  if (pgCode === "23503") return new AppError("conflict", "Other records still refer to this one.");
  if (pgCode === "22P02" || pgCode === "22003" || pgCode === "22007" || pgCode === "22008") return new AppError("invalid", "A value was not in the expected form.");
  if (pgCode === "22021" || pgCode === "22P05") return new AppError("invalid", "The text contains characters that cannot be stored (for example a NUL character).");
  if (pgCode === "22001") return new AppError("invalid", "A text is longer than allowed.");
  if (pgCode === "54001") return new AppError("invalid", "The input is too deeply nested or too large.");
  if (pgCode === "ECONNREFUSED" || pgCode === "57P01" || pgCode === "57P03" || /ECONNREFUSED|Connection terminated|timeout exceeded when trying to connect/i.test(e?.message ?? "")) {
    return new AppError("unavailable", "The database is not reachable right now. Nothing was saved; try again in a moment.");
  }
  console.error("[rustline] unexpected error:", err);
  return new AppError("unavailable", "Something went wrong on our side. Nothing was saved.");
}
