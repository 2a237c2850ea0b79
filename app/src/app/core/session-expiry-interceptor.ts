import { HttpErrorResponse, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { Session } from './session';

/**
 * A 401 from any API call outside /api/auth means the session ended while a page was open:
 * send the user to sign in again and bring them back to where they were.
 */
export const sessionExpiryInterceptor: HttpInterceptorFn = (request, next) => {
  const session = inject(Session);
  const router = inject(Router);
  return next(request).pipe(
    catchError((failure: unknown) => {
      if (failure instanceof HttpErrorResponse && failure.status === 401 && !request.url.startsWith('/api/auth/')) {
        session.forget();
        const here = router.url;
        void router.navigate(['/sign-in'], { queryParams: here.startsWith('/sign-in') ? {} : { next: here } });
      }
      return throwError(() => failure);
    }),
  );
};
