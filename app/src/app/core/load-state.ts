/** A value fetched once for a page: still loading, arrived, or failed with a sentence to show. */
export type LoadState<T> = { status: 'loading' } | { status: 'ready'; value: T } | { status: 'failed'; message: string };
