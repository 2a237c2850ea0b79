import type { FieldError } from '../validation/field-errors';

/** Every socket acknowledgement: data on success, field errors otherwise. */
export type Ack<T> = { status: 'ok'; data: T } | { status: 'error'; errors: FieldError[] };

export type AckCallback<T> = (response: Ack<T>) => void;
