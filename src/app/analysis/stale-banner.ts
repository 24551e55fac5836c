import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { DataChanges } from '../../../shared/analysis';

/**
 * The banner a stale analysis cannot hide: its runs changed after it was saved, so its numbers no longer
 * describe today's data. Lists what changed, run by run.
 */
@Component({
  selector: 'sm-stale-banner',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    <section class="stale" role="alert" data-testid="stale-banner">
      <h2><mat-icon>sync_problem</mat-icon>STALE — the data changed since this analysis was saved</h2>
      <p>
        These results describe the runs as they were. {{ approved() ? 'It was approved on the old data and cannot be approved again.' : '' }}
        Save a new analysis from the workspace to analyse today's data.
      </p>
      @if (changes(); as c) {
        <ul>
          @for (a of c.added; track a.runId) {
            <li><b>{{ a.code }}</b> now included (value {{ a.value }})</li>
          }
          @for (r of c.removed; track r.runId) {
            <li><b>{{ r.code }}</b> dropped: {{ r.why }} (was {{ r.value }})</li>
          }
          @for (e of c.edited; track e.runId + e.field) {
            <li><b>{{ e.code }}</b> {{ e.field }}: {{ e.oldValue ?? '—' }} → {{ e.newValue ?? '—' }}</li>
          }
        </ul>
        <p class="total">{{ total() }} change{{ total() === 1 ? '' : 's' }} in all.</p>
      }
    </section>
  `,
  styles: `
    .stale {
      border: 2px solid var(--mat-sys-error);
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
      border-radius: var(--mat-sys-corner-large);
      padding: 14px 18px;
    }
    h2 {
      display: flex;
      align-items: center;
      gap: 8px;
      font: var(--mat-sys-title-large);
      font-weight: 700;
    }
    p {
      margin: 6px 0;
    }
    ul {
      margin: 4px 0;
      max-height: 180px;
      overflow: auto;
    }
    .total {
      font: var(--mat-sys-body-small);
    }
  `,
})
export class StaleBanner {
  readonly changes = input<DataChanges | null>(null);
  readonly approved = input(false);
  protected readonly total = computed(() => {
    const c = this.changes();
    return c ? c.added.length + c.removed.length + c.edited.length : 0;
  });
}
