import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { RunCounts as Counts } from '../../../shared/analysis';

/** How the study's runs were used: always shown beside results, so nobody reads an ANOVA blind to exclusions. */
@Component({
  selector: 'sm-run-counts',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    <dl class="counts" data-testid="run-counts">
      <div class="used"><dt>Used</dt><dd data-count="used">{{ counts().used }}</dd></div>
      <div>
        <dt>Excluded invalid</dt>
        <dd data-count="excluded">{{ counts().excludedInvalid }}</dd>
      </div>
      <div><dt>Missing value</dt><dd data-count="missing">{{ counts().missingValue }}</dd></div>
      @if (counts().removed > 0) {
        <div><dt>Removed</dt><dd>{{ counts().removed }}</dd></div>
      }
      @if (counts().centrePoints > 0) {
        <div><dt>Centre points (left out)</dt><dd>{{ counts().centrePoints }}</dd></div>
      }
      @if (counts().invalidIncluded > 0) {
        <div class="warn"><dt>Invalid kept in</dt><dd>{{ counts().invalidIncluded }}</dd></div>
      }
    </dl>
    @if (counts().byReason.length > 0) {
      <ul class="reasons" aria-label="Invalid runs by reason">
        @for (r of counts().byReason; track r.outcome) {
          <li><mat-icon inline aria-hidden="true">block</mat-icon>{{ r.outcome }}: {{ r.count }}</li>
        }
      </ul>
    }
    <p class="total">of {{ counts().total }} runs in the study</p>
  `,
  styles: `
    .counts {
      display: grid;
      grid-template-columns: repeat(3, 1fr);
      gap: 6px;
      margin: 0;
    }
    .counts div {
      padding: 6px 8px;
      border-radius: var(--mat-sys-corner-small);
      background: var(--mat-sys-surface-container);
    }
    .counts .used {
      background: var(--mat-sys-primary-container);
      color: var(--mat-sys-on-primary-container);
    }
    .counts .warn {
      background: var(--sm-accent-container);
      color: var(--sm-on-accent-container);
    }
    dt {
      font: var(--mat-sys-label-small);
    }
    dd {
      margin: 0;
      font: var(--mat-sys-title-medium);
      font-variant-numeric: tabular-nums;
    }
    .reasons {
      list-style: none;
      padding: 0;
      margin: 8px 0 0;
      font: var(--mat-sys-body-small);
    }
    .reasons mat-icon {
      vertical-align: -2px;
      margin-right: 4px;
    }
    .total {
      margin: 6px 0 0;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class RunCounts {
  readonly counts = input.required<Counts>();
}
