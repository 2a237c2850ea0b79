import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';
import { Session } from './session';

/**
 * Opens admin pages (team management, dev mailbox) only for admins; others land on the library.
 * The server refuses the same calls whatever this guard does; it only spares a page of 403s.
 * Runs under the signed-in shell, whose guard has already loaded the user.
 */
export const adminGuard: CanActivateFn = () => {
  const user = inject(Session).user();
  return user?.role === 'admin' ? true : inject(Router).createUrlTree(['/library']);
};
