import { DEFAULT_LANDING_URL, safeReturnUrl } from './safe-return-url';

describe('safeReturnUrl', () => {
  it('follows a path inside the app', () => {
    expect(safeReturnUrl('/bench/3')).toBe('/bench/3');
    expect(safeReturnUrl('/library?sort=name')).toBe('/library?sort=name');
  });

  it('refuses anything that could leave the app or loop back to sign-in', () => {
    for (const next of [null, '', 'https://elsewhere.example', '//elsewhere.example', '/\\elsewhere.example', '/', '/sign-in', 'library']) {
      expect(safeReturnUrl(next)).toBe(DEFAULT_LANDING_URL);
    }
  });
});
