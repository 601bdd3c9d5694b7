/**
 * The one error type routes and services throw. The error middleware turns it into
 * `{ error: { code, message, field? } }` with the given HTTP status.
 */
export class AppError extends Error {
  constructor(
    readonly code: string,
    readonly status: number,
    message: string,
    readonly field?: string,
  ) {
    super(message)
    this.name = 'AppError'
  }
}

export const notFound = (code: string, message: string) => new AppError(code, 404, message)
export const forbidden = (message = 'Your role in this room does not allow this.') =>
  new AppError('forbidden', 403, message)
export const signedOut = () => new AppError('signed_out', 401, 'Sign in first.')
