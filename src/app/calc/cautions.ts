import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The assumptions a result rests on and the cautions against misuse, shown beside every result. */
@Component({
  selector: 'sm-calc-cautions',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    @if (assumptions().length) {
      <section class="block" aria-label="Assumptions">
        <h3><mat-icon aria-hidden="true">rule</mat-icon> Assumptions</h3>
        <ul>
          @for (a of assumptions(); track a) {
            <li>{{ a }}</li>
          }
        </ul>
      </section>
    }
    <section class="block caution" aria-label="Cautions" data-testid="calc-cautions">
      <h3><mat-icon aria-hidden="true">warning</mat-icon> Before you use these numbers</h3>
      <ul>
        @for (c of cautions(); track c) {
          <li>{{ c }}</li>
        }
      </ul>
    </section>
  `,
  styles: `
    :host {
      display: grid;
      gap: 12px;
    }
    .block {
      border-radius: var(--mat-sys-corner-medium);
      padding: 12px 16px;
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface);
    }
    .caution {
      background: var(--sm-accent-container);
      color: var(--sm-on-accent-container);
    }
    h3 {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: 0 0 6px;
      font: var(--mat-sys-title-small);
    }
    ul {
      margin: 0;
      padding-left: 20px;
    }
    li {
      margin: 2px 0;
      font: var(--mat-sys-body-medium);
    }
  `,
})
export class CalcCautions {
  readonly assumptions = input<readonly string[]>([]);
  readonly cautions = input.required<readonly string[]>();
}
