/** The closed-form engine module from shared/, fetched on first use. */
export type ClosedFormEngine = typeof import('@kinetwin/shared/closed-form/index');

let loading: Promise<ClosedFormEngine> | null = null;

/**
 * Loads the closed-form engine once per page; its code stays out of the bench's own chunk so the
 * page draws before the engine arrives. A failed load is forgotten, so a later call retries.
 */
export function loadClosedFormEngine(): Promise<ClosedFormEngine> {
  loading ??= import('@kinetwin/shared/closed-form/index').catch((failure: unknown) => {
    loading = null;
    throw failure;
  });
  return loading;
}
