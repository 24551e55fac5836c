import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { AnalysisStatus } from '../../../shared/analysis';

const LOOK: Record<AnalysisStatus, { label: string; icon: string }> = {
  draft: { label: 'Draft', icon: 'edit_note' },
  in_review: { label: 'In review', icon: 'rate_review' },
  returned: { label: 'Returned', icon: 'assignment_return' },
  approved: { label: 'Approved', icon: 'verified' },
};

/** Status of a saved analysis as icon + word (never colour alone), plus a STALE mark when its data changed. */
@Component({
  selector: 'sm-status-chip',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    <span class="chip" [class]="status()" data-testid="analysis-status"><mat-icon inline>{{ look().icon }}</mat-icon>{{ look().label }}</span>
    @if (stale()) {
      <span class="chip stale" data-testid="stale-chip"><mat-icon inline>sync_problem</mat-icon>STALE</span>
    }
  `,
  styles: `
    :host {
      display: inline-flex;
      gap: 6px;
    }
    .chip {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 2px 10px;
      border-radius: var(--mat-sys-corner-full);
      font: var(--mat-sys-label-medium);
      background: var(--mat-sys-surface-container-high);
      color: var(--mat-sys-on-surface);
    }
    .approved {
      background: var(--mat-sys-primary-container);
      color: var(--mat-sys-on-primary-container);
    }
    .in_review {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    .returned,
    .stale {
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
    .stale {
      font-weight: 700;
      letter-spacing: 0.06em;
    }
  `,
})
export class StatusChip {
  readonly status = input.required<AnalysisStatus>();
  readonly stale = input(false);
  protected readonly look = computed(() => LOOK[this.status()]);
}
