import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import type { Handoff } from '@kinetwin/shared/protocol/library-api';
import { LibraryApi } from '../core/library-api';
import type { LoadState } from '../core/load-state';
import { readyValue, toLoadState } from '../core/to-load-state';

/** "Handed to me": scenarios teammates handed to the signed-in user, newest first, and those they handed on. */
@Component({
  selector: 'kt-handed-to-me',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, RouterLink],
  templateUrl: './handed-to-me.html',
  styleUrl: './handed-to-me.css',
})
export class HandedToMe {
  private readonly library = inject(LibraryApi);

  protected readonly received = toSignal(this.library.handedToMe().pipe(toLoadState()), { initialValue: { status: 'loading' } as LoadState<Handoff[]> });
  protected readonly sent = toSignal(this.library.handedByMe().pipe(toLoadState()), { initialValue: { status: 'loading' } as LoadState<Handoff[]> });
  protected readonly receivedItems = computed(() => readyValue(this.received()) ?? []);
  protected readonly sentItems = computed(() => readyValue(this.sent()) ?? []);
  protected readonly failure = computed(() => {
    const state = this.received();
    return state.status === 'failed' ? state.message : null;
  });
}
