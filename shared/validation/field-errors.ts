import type { z } from 'zod';

/** One reason an input was refused, with the dotted path of the field it concerns. */
export interface FieldError {
  /** Dotted path into the input, e.g. "joint.inertia" or "inputs.2.width"; "" for the whole input. */
  field: string;
  message: string;
}

/** Errors as values at every boundary: a parse either yields the data or says what was wrong. */
export type Parsed<T> = { ok: true; value: T } | { ok: false; errors: FieldError[] };

/** Most field errors reported for one input; a garbage file should not produce a megabyte of them. */
export const MAX_FIELD_ERRORS = 50;

/** Flattens a zod error into field errors that name the field and the reason. */
export function fieldErrorsOf(error: z.ZodError, input: unknown): FieldError[] {
  return error.issues.slice(0, MAX_FIELD_ERRORS).map((issue) => {
    const field = issue.path.map(String).join('.');
    // A missing key would otherwise get the type message ("must be a finite number"): say it plainly.
    const missing = issue.code === 'invalid_type' && valueAt(input, issue.path) === undefined;
    const message = missing ? `${field || 'value'} is required` : issue.message;
    return { field, message };
  });
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let node = input;
  for (const key of path) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<PropertyKey, unknown>)[key];
  }
  return node;
}

/** Runs a zod schema and returns errors as values instead of throwing. */
export function parseWith<S extends z.ZodType>(schema: S, input: unknown): Parsed<z.output<S>> {
  const result = schema.safeParse(input);
  return result.success ? { ok: true, value: result.data } : { ok: false, errors: fieldErrorsOf(result.error, input) };
}

/** One line naming every field error, for logs and the command line. */
export function describeFieldErrors(errors: readonly FieldError[]): string {
  return errors.map((e) => (e.field ? `"${e.field}": ${e.message}` : e.message)).join('; ');
}
