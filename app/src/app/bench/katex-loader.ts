/** KaTeX's module, fetched on first use. */
export type Katex = typeof import('katex').default;

/** The stylesheet angular.json builds from katex/dist/katex.min.css (bundleName "katex", not injected). */
export const KATEX_STYLESHEET = 'katex.css';

let loading: Promise<Katex> | null = null;

/**
 * Loads KaTeX and links its stylesheet (fonts come from node_modules through the build, never a
 * CDN) once per page. A failed load is forgotten, so a later call retries.
 */
export function loadKatex(): Promise<Katex> {
  if (!document.head.querySelector(`link[data-katex-stylesheet]`)) {
    const link = document.createElement('link');
    link.rel = 'stylesheet';
    link.href = KATEX_STYLESHEET;
    link.dataset['katexStylesheet'] = '';
    document.head.appendChild(link);
  }
  loading ??= import('katex').then(
    (module) => module.default,
    (failure: unknown) => {
      loading = null;
      throw failure;
    },
  );
  return loading;
}
