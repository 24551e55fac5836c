import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { STATUS_LABELS, type StudyStatus } from '../../../shared/studies';

/** The study status as a small labelled pill; the text carries the meaning, the colour only helps. */
@Component({
  selector: 'sm-status-chip',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<span class="chip" [attr.data-status]="status()">{{ label() }}</span>`,
  styles: `
    .chip {
      display: inline-block;
      padding: 2px 10px;
      border-radius: 999px;
      font: var(--mat-sys-label-medium);
      border: 1px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface);
      white-space: nowrap;
    }
    [data-status='planned'],
    [data-status='collecting'] {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    [data-status='analysed'],
    [data-status='in_review'] {
      background: var(--sm-accent-container);
      color: var(--sm-on-accent-container);
    }
    [data-status='approved'] {
      background: var(--mat-sys-primary);
      color: var(--mat-sys-on-primary);
    }
  `,
})
export class StatusChip {
  readonly status = input.required<StudyStatus>();
  protected readonly label = computed(() => STATUS_LABELS[this.status()]);
}
