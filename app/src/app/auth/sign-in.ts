import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import type { AppInfo } from '@kinetwin/shared/protocol/api-types';
import { catchError, map, of } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { AppInfoApi } from '../core/app-info-api';
import type { LoadState } from '../core/load-state';
import { Session } from '../core/session';
import { safeReturnUrl } from './safe-return-url';

type DemoAccount = AppInfo['demoAccounts'][number];

/** The sign-in page; in demo mode it also lists the seeded accounts with a button to fill each in. */
@Component({
  selector: 'kt-sign-in',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, RouterLink],
  templateUrl: './sign-in.html',
  styleUrls: ['./auth-page.css', './sign-in.css'],
})
export class SignIn {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);

  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.email] }),
    password: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
  });

  private readonly errorText = signal<string | null>(null);
  protected readonly error = this.errorText.asReadonly();
  private readonly busy = signal(false);
  protected readonly signingIn = this.busy.asReadonly();

  protected readonly appInfo = toSignal(
    inject(AppInfoApi)
      .load()
      .pipe(
        map((value): LoadState<AppInfo> => ({ status: 'ready', value })),
        catchError((failure: unknown) => of<LoadState<AppInfo>>({ status: 'failed', message: apiErrorMessage(failure) })),
      ),
    { initialValue: { status: 'loading' } as LoadState<AppInfo> },
  );
  protected readonly demoAccounts = computed(() => {
    const info = this.appInfo();
    return info.status === 'ready' && info.value.demoMode ? info.value.demoAccounts : [];
  });
  protected readonly version = computed(() => {
    const info = this.appInfo();
    return info.status === 'ready' ? info.value.version : null;
  });
  protected readonly appInfoFailure = computed(() => {
    const info = this.appInfo();
    return info.status === 'failed' ? info.message : null;
  });

  protected fillDemoAccount(account: DemoAccount): void {
    this.form.setValue({ email: account.email, password: account.password });
    this.errorText.set(null);
  }

  protected async signIn(): Promise<void> {
    if (this.busy()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.errorText.set(null);
    try {
      await this.session.signIn(this.form.getRawValue());
      await this.router.navigateByUrl(safeReturnUrl(this.route.snapshot.queryParamMap.get('next')));
    } catch (failure) {
      this.errorText.set(apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
