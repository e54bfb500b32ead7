// Errors a route handler (or the code it calls) throws to answer the user. The route wrapper turns
// them into JSON `{ error, field? }` with the status; anything else becomes a plain 500.
/** 503: a service we depend on (the SMTP server) is unreachable; the request changed nothing. */
export type ApiStatus = 400 | 401 | 403 | 404 | 409 | 410 | 429 | 503;

export class ApiError extends Error {
  constructor(
    readonly status: ApiStatus,
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

export const badRequest = (message: string, field?: string) => new ApiError(400, message, field);
export const unauthorized = (message = 'Sign in first.') => new ApiError(401, message);
export const forbidden = (message: string) => new ApiError(403, message);
export const notFound = (message: string) => new ApiError(404, message);
export const conflict = (message: string, field?: string) => new ApiError(409, message, field);
