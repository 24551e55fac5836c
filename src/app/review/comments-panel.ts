import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, input, model, output, signal, viewChild } from '@angular/core';
import { NgTemplateOutlet } from '@angular/common';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { CommentThread } from '../../../shared/analysis';
import { ApiError } from '../core/api-error';
import { formatWhen } from '../analysis/format';
import { anchorLabel } from './anchor-label';
import { ReviewApi } from './review-api';

/**
 * The discussion of one analysis: threads (whole analysis or anchored to a row or chart), replies,
 * resolve / reopen. The anchor of a new comment is set by the comment buttons on tables and charts.
 */
@Component({
  selector: 'sm-comments-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NgTemplateOutlet, ReactiveFormsModule, MatButtonModule, MatChipsModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './comments-panel.html',
  styleUrl: './comments-panel.scss',
})
export class CommentsPanel {
  private readonly api = inject(ReviewApi);
  readonly analysisId = input.required<number>();
  readonly threads = input.required<CommentThread[]>();
  readonly canComment = input(false);
  /** anchor of the next new comment; 'analysis' for the whole analysis */
  readonly anchor = model('analysis');
  /** bumped by the page each time a comment button is pressed, to bring the form into view */
  readonly focusRequest = input(0);
  readonly changed = output<void>();

  private readonly box = viewChild<ElementRef<HTMLTextAreaElement>>('box');
  protected readonly label = anchorLabel;
  protected readonly when = formatWhen;
  protected readonly body = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(8000)] });
  protected readonly reply = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(8000)] });
  protected readonly replyingTo = signal<number | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly showResolved = signal(false);

  protected readonly open = computed(() => this.threads().filter((t) => t.resolvedAt === null));
  protected readonly resolved = computed(() => this.threads().filter((t) => t.resolvedAt !== null));

  constructor() {
    effect(() => {
      if (this.focusRequest() > 0) {
        const el = this.box()?.nativeElement;
        el?.scrollIntoView({ block: 'center', behavior: 'smooth' });
        el?.focus({ preventScroll: true });
      }
    });
  }

  private done(): void {
    this.busy.set(false);
    this.changed.emit();
  }

  private failed(e: unknown): void {
    this.busy.set(false);
    this.error.set(e instanceof ApiError ? e.message : 'The comment could not be saved.');
  }

  protected postComment(): void {
    if (this.body.invalid) {
      this.error.set('Write a comment first.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.api.addComment(this.analysisId(), { body: this.body.value.trim(), anchor: this.anchor() }).subscribe({
      next: () => {
        this.body.reset();
        this.anchor.set('analysis');
        this.done();
      },
      error: (e: unknown) => this.failed(e),
    });
  }

  protected postReply(parentId: number): void {
    if (this.reply.invalid) {
      this.error.set('Write a reply first.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.api.addComment(this.analysisId(), { body: this.reply.value.trim(), parentId }).subscribe({
      next: () => {
        this.reply.reset();
        this.replyingTo.set(null);
        this.done();
      },
      error: (e: unknown) => this.failed(e),
    });
  }

  protected setResolved(thread: CommentThread, resolved: boolean): void {
    this.busy.set(true);
    this.api.resolve(this.analysisId(), thread.id, resolved).subscribe({ next: () => this.done(), error: (e: unknown) => this.failed(e) });
  }
}
