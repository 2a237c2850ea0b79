/** The frequency-response module from shared/, fetched on first use. */
export type FrequencyEngine = typeof import('@kinetwin/shared/frequency/frequency-response');

let loading: Promise<FrequencyEngine> | null = null;

/**
 * Loads the frequency response once per page. It pulls in the closed form's transfer functions
 * and root finder, which stay out of the bench's own chunk (as the closed-form engine does). A
 * failed load is forgotten, so a later call retries.
 */
export function loadFrequencyEngine(): Promise<FrequencyEngine> {
  loading ??= import('@kinetwin/shared/frequency/frequency-response').catch((failure: unknown) => {
    loading = null;
    throw failure;
  });
  return loading;
}
