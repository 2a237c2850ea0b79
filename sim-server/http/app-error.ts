import type { FieldError } from '../../shared/validation/field-errors';

/** An error the API answers with its own status and message; everything else is a 500. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: FieldError[],
  ) {
    super(message);
    this.name = 'AppError';
  }

  static badRequest(message: string, fields?: FieldError[]) {
    return new AppError(400, 'bad_request', message, fields);
  }
  static unauthorized(message = 'Sign in first.') {
    return new AppError(401, 'unauthorized', message);
  }
  static notFound(message: string) {
    return new AppError(404, 'not_found', message);
  }
}
