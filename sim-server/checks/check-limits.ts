// Bounds of the checks API, in a file of their own so config.ts can quote them as defaults
// without loading the worker pool.

/**
 * Longest one checks job may take from being accepted to its answer, ms (waiting for a free worker
 * included, so a request never hangs longer). The demo scenarios take well under a second; a
 * sampled 1 ms loop over a long horizon can take minutes, and is stopped here instead.
 */
export const CHECK_TIME_LIMIT_MS = 60_000;

/** Jobs that may wait for a free worker beyond the ones running; one more is refused with 503. */
export const CHECK_QUEUE_SIZE = 8;

/** Checks requests one user may send per CHECK_RATE_WINDOW_MS; each one runs dozens of twin runs. */
export const CHECK_RATE_LIMIT = 30;
/** Window of CHECK_RATE_LIMIT, ms. */
export const CHECK_RATE_WINDOW_MS = 60_000;
