import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';

export interface OutboxSummary {
  id: number;
  sender: string;
  recipients: string | string[];
  subject: string;
  receivedAt: string;
}

export function recipientList(recipients: string | string[]): string {
  return Array.isArray(recipients) ? recipients.join(', ') : recipients;
}

/** Mail caught by the built-in fake SMTP server (development, demo, tests): nothing here left the machine. */
@Component({
  selector: 'sm-outbox',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatButtonModule, MatIconModule, MatProgressBarModule, MatTableModule],
  template: `
    <section class="sm-page">
      <div class="page-head">
        <div>
          <h1 class="sm-page-title">Mail outbox</h1>
          <p class="sm-page-lead">
            This server runs without a real mail server, so every mail it sends is kept here instead. Open one to
            read it and follow its links.
          </p>
        </div>
        <button mat-stroked-button (click)="messages.reload()"><mat-icon>refresh</mat-icon> Refresh</button>
      </div>
      <div class="sm-panel table-panel">
        @if (messages.isLoading()) {
          <mat-progress-bar mode="indeterminate" />
        }
        @if (messages.error(); as error) {
          <div class="sm-note sm-note-error" role="alert">
            <mat-icon>error</mat-icon>
            <span>The outbox could not be loaded: {{ error.message }}</span>
          </div>
        }
        <table mat-table [dataSource]="rows()" class="admin-table" aria-label="Mail outbox">
          <ng-container matColumnDef="receivedAt">
            <th mat-header-cell *matHeaderCellDef>Received</th>
            <td mat-cell *matCellDef="let m">{{ m.receivedAt | date: 'medium' }}</td>
          </ng-container>
          <ng-container matColumnDef="recipients">
            <th mat-header-cell *matHeaderCellDef>To</th>
            <td mat-cell *matCellDef="let m">{{ m.to }}</td>
          </ng-container>
          <ng-container matColumnDef="subject">
            <th mat-header-cell *matHeaderCellDef>Subject</th>
            <td mat-cell *matCellDef="let m">{{ m.subject }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr
            mat-row
            *matRowDef="let m; columns: columns"
            class="clickable"
            tabindex="0"
            (click)="openMessage(m.id)"
            (keydown.enter)="openMessage(m.id)"
            [attr.data-mail]="m.to"
          ></tr>
          <tr class="mat-mdc-row" *matNoDataRow>
            <td class="empty-row" [attr.colspan]="columns.length">No mail yet. Invitations and password resets appear here.</td>
          </tr>
        </table>
      </div>
    </section>
  `,
  styleUrl: './admin.scss',
})
export class Outbox {
  private readonly router = inject(Router);
  protected readonly messages = httpResource<{ messages: OutboxSummary[] }>(() => '/api/mail/outbox');
  protected readonly rows = computed(() =>
    (this.messages.hasValue() ? this.messages.value().messages : []).map((m) => ({ ...m, to: recipientList(m.recipients) })),
  );
  protected readonly columns = ['receivedAt', 'recipients', 'subject'];

  protected openMessage(id: number): void {
    void this.router.navigate(['/admin/outbox', id]);
  }
}
