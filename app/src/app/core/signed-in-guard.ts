import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';
import { Session } from './session';

/** Lets a route open only for a signed-in user; everyone else goes to /sign-in and comes back after. */
export const signedInGuard: CanActivateFn = async (_route, state) => {
  const session = inject(Session);
  const router = inject(Router);
  if (session.user()) return true;
  try {
    if (await session.refresh()) return true;
  } catch {
    // Server unreachable or failing: the sign-in page says so when it loads its own data.
  }
  return router.createUrlTree(['/sign-in'], { queryParams: { next: state.url } });
};
