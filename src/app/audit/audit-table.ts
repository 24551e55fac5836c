import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { AuditEvent } from '../studies/study-types';

/** Audit rows as a plain table; used by the audit page and the per-run history. */
@Component({
  selector: 'sm-audit-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe],
  template: `
    @if (events().length) {
      <div class="scroll">
        <table class="audit" aria-label="Audit trail">
          <thead>
            <tr>
              <th>When</th>
              <th>Who</th>
              @if (showRun()) {
                <th>Run</th>
              }
              <th>What</th>
              <th>Field</th>
              <th>Before</th>
              <th>After</th>
              <th>Reason</th>
            </tr>
          </thead>
          <tbody>
            @for (e of events(); track e.id) {
              <tr>
                <td class="nowrap">{{ e.at | date: 'd MMM y, HH:mm:ss' }}</td>
                <td>{{ e.user?.name ?? (e.tokenId ? 'API token #' + e.tokenId : 'system') }}</td>
                @if (showRun()) {
                  <td>{{ e.runCode ?? '' }}</td>
                }
                <td>{{ e.entity }} · {{ e.action }}</td>
                <td>{{ e.field ?? '' }}</td>
                <td class="value">{{ e.oldValue ?? '' }}</td>
                <td class="value">{{ e.newValue ?? '' }}</td>
                <td>{{ e.reason ?? '' }}</td>
              </tr>
            }
          </tbody>
        </table>
      </div>
    } @else {
      <p class="none">No recorded changes.</p>
    }
  `,
  styles: `
    .scroll {
      overflow: auto;
    }
    .audit {
      width: 100%;
      border-collapse: collapse;
      font: var(--mat-sys-body-small);
      th,
      td {
        text-align: left;
        padding: 6px 8px;
        border-bottom: 1px solid var(--mat-sys-outline-variant);
        vertical-align: top;
      }
      th {
        font: var(--mat-sys-label-medium);
        color: var(--mat-sys-on-surface-variant);
        position: sticky;
        top: 0;
        background: var(--mat-sys-surface-container);
      }
    }
    .nowrap {
      white-space: nowrap;
    }
    .value {
      max-width: 260px;
      overflow-wrap: anywhere;
      font-family: ui-monospace, monospace;
    }
    .none {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class AuditTable {
  readonly events = input.required<AuditEvent[]>();
  readonly showRun = input(true);
}
