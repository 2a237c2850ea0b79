import { DatePipe, NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { type Comment, MAX_COMMENT_LENGTH, type TeamMember } from '@kinetwin/shared/protocol/library-api';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';
import { type TextSegment, mentionSegments } from './mention-segments';

/** Comments on one revision, threaded, with mentions of teammates highlighted; new ones and replies. */
@Component({
  selector: 'kt-comment-thread',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatButtonModule, MatFormFieldModule, MatInputModule, NgTemplateOutlet],
  templateUrl: './comment-thread.html',
  styleUrl: './comment-thread.css',
})
export class CommentThread {
  private readonly library = inject(LibraryApi);

  readonly scenarioId = input.required<number>();
  readonly revision = input.required<number>();
  readonly comments = input.required<readonly Comment[]>();
  readonly members = input<readonly TeamMember[]>([]);
  readonly canComment = input(false);
  /** A comment or reply was stored; the page reloads the thread. */
  readonly posted = output<Comment>();

  protected readonly maxLength = MAX_COMMENT_LENGTH;
  private readonly drafts = signal<Record<string, string>>({});
  private readonly replyTo = signal<number | null>(null);
  protected readonly replyingTo = this.replyTo.asReadonly();
  private readonly busy = signal(false);
  protected readonly posting = this.busy.asReadonly();
  private readonly failureText = signal<string | null>(null);
  protected readonly failure = this.failureText.asReadonly();

  private readonly emailOf = computed(() => new Map(this.members().map((member) => [member.id, member.email.toLowerCase()])));
  protected readonly mentionHint = computed(() => {
    const someone = this.members()[0];
    return someone ? `Mention a teammate as @${someone.email}` : 'Mention a teammate as @their e-mail address';
  });

  /** The body in runs of text and mentions; only mentions the server resolved are highlighted. */
  protected segments(comment: Comment): TextSegment[] {
    const emails = this.emailOf();
    const resolved = new Set(comment.mentions.map((person) => emails.get(person.id)).filter((email): email is string => email !== undefined));
    return mentionSegments(comment.body, resolved);
  }

  protected draft(key: string): string {
    return this.drafts()[key] ?? '';
  }

  protected setDraft(key: string, text: string): void {
    this.drafts.update((drafts) => ({ ...drafts, [key]: text }));
  }

  protected startReply(id: number): void {
    this.replyTo.set(this.replyTo() === id ? null : id);
  }

  protected async post(parentId: number | null): Promise<void> {
    const key = parentId === null ? 'new' : String(parentId);
    const body = this.draft(key).trim();
    if (!body || this.busy()) return;
    this.busy.set(true);
    this.failureText.set(null);
    try {
      const comment = await firstValueFrom(this.library.postComment(this.scenarioId(), this.revision(), parentId === null ? { body } : { body, parentId }));
      this.setDraft(key, '');
      this.replyTo.set(null);
      this.posted.emit(comment);
    } catch (failure) {
      this.failureText.set(apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
