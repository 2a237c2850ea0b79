import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterOutlet } from '@angular/router';
import { apiErrorMessage } from '../core/api-error-message';
import { Session } from '../core/session';

/** The frame of every signed-in page: the toolbar with the user and sign-out, then the page. */
@Component({
  selector: 'kt-signed-in-shell',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule, MatToolbarModule, RouterLink, RouterOutlet],
  templateUrl: './signed-in-shell.html',
  styleUrl: './signed-in-shell.css',
})
export class SignedInShell {
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  protected readonly user = this.session.user;
  private readonly signOutError = signal<string | null>(null);
  protected readonly signOutFailure = this.signOutError.asReadonly();

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
