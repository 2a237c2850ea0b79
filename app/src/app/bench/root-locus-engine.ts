/** The root-locus module from shared/, fetched on first use. */
export type RootLocusEngine = typeof import('@kinetwin/shared/frequency/root-locus');

let loading: Promise<RootLocusEngine> | null = null;

/**
 * Loads the root locus once per page; it pulls in the closed form's polynomial root finder, which
 * stays out of the bench's own chunk (as the frequency engine does). A failed load is forgotten,
 * so a later call retries.
 */
export function loadRootLocusEngine(): Promise<RootLocusEngine> {
  loading ??= import('@kinetwin/shared/frequency/root-locus').catch((failure: unknown) => {
    loading = null;
    throw failure;
  });
  return loading;
}
