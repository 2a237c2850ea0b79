import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { AccountApi } from '../core/account-api';
import { apiErrorMessage } from '../core/api-error-message';
import { Session } from '../core/session';

/** The frame of every signed-in page: the toolbar with the user and sign-out, then the page. */
@Component({
  selector: 'kt-signed-in-shell',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule, MatToolbarModule, RouterLink, RouterLinkActive, RouterOutlet],
  templateUrl: './signed-in-shell.html',
  styleUrl: './signed-in-shell.css',
})
export class SignedInShell {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly accounts = inject(AccountApi);

  protected readonly user = this.session.user;
  /** Team and mailbox links are for admins; the server refuses their calls to anyone else anyway. */
  protected readonly isAdmin = computed(() => this.session.user()?.role === 'admin');
  private readonly signOutError = signal<string | null>(null);
  protected readonly signOutFailure = this.signOutError.asReadonly();

  /** Ends every session of this account (other browsers too), then this page's. */
  protected async signOutEverywhere(): Promise<void> {
    this.signOutError.set(null);
    try {
      await firstValueFrom(this.accounts.signOutEverywhere());
      this.session.forget();
      await this.router.navigateByUrl('/sign-in');
    } catch (failure) {
      this.signOutError.set(apiErrorMessage(failure));
    }
  }

  protected async signOut(): Promise<void> {
    this.signOutError.set(null);
    try {
      await this.session.signOut();
      await this.router.navigateByUrl('/sign-in');
    } catch (failure) {
      this.signOutError.set(apiErrorMessage(failure));
    }
  }
}
