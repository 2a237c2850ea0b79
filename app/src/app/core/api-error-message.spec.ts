import { HttpErrorResponse } from '@angular/common/http';
import { UNREACHABLE_SERVER_MESSAGE, apiErrorMessage, apiFieldErrors } from './api-error-message';

describe('apiErrorMessage', () => {
  it("shows the server's own message from an ApiErrorBody", () => {
    const failure = new HttpErrorResponse({ status: 404, error: { error: { code: 'not_found', message: 'No scenario has id 99.' } } });
    expect(apiErrorMessage(failure)).toBe('No scenario has id 99.');
  });

  it('says the server is unreachable for status 0', () => {
    expect(apiErrorMessage(new HttpErrorResponse({ status: 0, error: new ProgressEvent('error') }))).toBe(UNREACHABLE_SERVER_MESSAGE);
  });

  it('falls back to the status when the body is not ours (e.g. a proxy page)', () => {
    expect(apiErrorMessage(new HttpErrorResponse({ status: 502, statusText: 'Bad Gateway', error: '<html>' }))).toBe('The server answered 502 Bad Gateway.');
  });

  it('returns the field errors attached to a refusal', () => {
    const fields = [{ field: 'email', message: 'email is required' }];
    expect(apiFieldErrors(new HttpErrorResponse({ status: 400, error: { error: { code: 'invalid', message: 'Check the form.', fields } } }))).toEqual(fields);
    expect(apiFieldErrors(new Error('x'))).toEqual([]);
  });
});
