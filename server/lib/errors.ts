export type ErrorDetail = { path: string; message: string };

/** An error the client is meant to see: a status, a stable code and a plain message. */
export class AppError extends Error {
  constructor(
    public status: number,
    public code: string,
    message: string,
    public details?: ErrorDetail[],
    public headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export const notFound = (what = 'record') =>
  new AppError(404, 'not_found', `That ${what} does not exist or is not shared with you.`);
export const forbidden = (message = 'You are not allowed to do that.') =>
  new AppError(403, 'forbidden', message);
export const unauthenticated = () => new AppError(401, 'auth.required', 'Please sign in.');
export const conflict = (code: string, message: string) => new AppError(409, code, message);

/**
 * A refusal that goes on the record. The refused change rolls back with its transaction, so the audit row is
 * written afterwards, in a transaction of its own, by whoever catches it (`auditRefusal`).
 */
export class AuditedRefusal extends AppError {
  constructor(
    status: number,
    code: string,
    message: string,
    public audit: { action: string; entityType: string; entityId: string; after?: Record<string, unknown> },
  ) {
    super(status, code, message);
  }
}
