/** Errors that carry enough to tell the user what is wrong and where. */

/** An expression that cannot be parsed or uses something it may not. */
export class ExpressionError extends Error {
  override name = 'ExpressionError';
  constructor(
    message: string,
    /** Where the expression was written, e.g. "flow.beta.g" or "claims[2].lhs". */
    readonly where: string,
    readonly expression: string,
    /** 1-based character position, when known. */
    readonly position?: number,
    /** The offending symbol, when the problem is one. */
    readonly symbol?: string,
  ) {
    super(message);
  }
}

/** A claim (or flow) field that is missing, malformed or inconsistent. */
export class ClaimInputError extends Error {
  override name = 'ClaimInputError';
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/** Raised inside a check when its time bound is reached or the caller cancelled. */
export class CheckStopped extends Error {
  override name = 'CheckStopped';
  constructor(readonly reason: 'time' | 'cancelled') {
    super(reason === 'time' ? 'the check reached its time bound' : 'the check was cancelled');
  }
}

/** A short, user-facing message for anything thrown (never a stack trace). */
export function describeError(error: unknown): string {
  if (error instanceof Error) return error.message;
  return String(error);
}
