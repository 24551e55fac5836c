import { DatePipe, DOCUMENT } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { mailSegments } from './mail-links';
import { OutboxSummary, recipientList } from './outbox';

interface OutboxMessageDetail extends OutboxSummary {
  textBody: string | null;
  htmlBody: string | null;
}

/**
 * One caught mail. Shows the plain-text part (the HTML part is not rendered: it would need a frame and
 * relaxed CSP for no gain; both parts carry the same links).
 */
@Component({
  selector: 'sm-outbox-message',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    <section class="sm-page">
      <a mat-button routerLink="/admin/outbox"><mat-icon>arrow_back</mat-icon> Mail outbox</a>
      @if (message.isLoading()) {
        <mat-progress-bar mode="indeterminate" />
      }
      @if (message.error(); as error) {
        <div class="sm-note sm-note-error" role="alert">
          <mat-icon>error</mat-icon>
          <span>This mail could not be loaded: {{ error.message }}</span>
        </div>
      }
      @if (mail(); as m) {
        <article class="sm-panel mail">
          <h1 class="sm-page-title">{{ m.subject }}</h1>
          <dl class="headers">
            <dt>From</dt>
            <dd>{{ m.sender }}</dd>
            <dt>To</dt>
            <dd>{{ m.to }}</dd>
            <dt>Received</dt>
            <dd>{{ m.receivedAt | date: 'medium' }}</dd>
          </dl>
          <pre class="body" data-testid="mail-body">@for (part of segments(); track $index) {@if (part.href) {<a [href]="part.href">{{ part.text }}</a>} @else {{{ part.text }}}}</pre>
        </article>
      }
    </section>
  `,
  styles: `
    .mail { margin-top: 12px; }
    .headers {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 4px 16px;
      margin: 16px 0;
      padding-bottom: 16px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      dt { color: var(--mat-sys-on-surface-variant); }
      dd { margin: 0; overflow-wrap: anywhere; }
    }
    .body {
      margin: 0;
      white-space: pre-wrap;
      overflow-wrap: anywhere;
      font: var(--mat-sys-body-large);
    }
  `,
})
export class OutboxMessage {
  private readonly origin = inject(DOCUMENT).location.origin;

  /** Route parameter :id. */
  readonly id = input.required<string>();

  protected readonly message = httpResource<{ message: OutboxMessageDetail }>(() => `/api/mail/outbox/${encodeURIComponent(this.id())}`);
  protected readonly mail = computed(() => {
    if (!this.message.hasValue()) return null;
    const m = this.message.value().message;
    return { ...m, to: recipientList(m.recipients) };
  });
  protected readonly segments = computed(() => mailSegments(this.mail()?.textBody ?? '(This mail has no plain-text part.)', this.origin));
}
