import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** One result panel: a heading, the short plain-language reading, then the numbers. */
@Component({
  selector: 'sm-result-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  host: { '[attr.data-panel]': 'panel()' },
  template: `
    <section class="sm-panel" [attr.aria-labelledby]="panel() + '-title'">
      <h2 [id]="panel() + '-title'"><mat-icon>{{ icon() }}</mat-icon>{{ title() }}</h2>
      @if (reading()) {
        <p class="reading" data-testid="reading"><span class="reading-tag">Reading</span>{{ reading() }}</p>
      }
      <ng-content />
    </section>
  `,
  styles: `
    :host {
      display: block;
      min-width: 0;
    }
    section {
      padding: 18px 20px;
    }
    h2 {
      display: flex;
      align-items: center;
      gap: 8px;
      font: var(--mat-sys-title-medium);
      margin-bottom: 8px;
    }
    h2 mat-icon {
      color: var(--mat-sys-primary);
    }
    .reading {
      margin: 0 0 14px;
      padding: 8px 12px;
      border-left: 3px solid var(--sm-accent);
      background: var(--mat-sys-surface-container-low);
      border-radius: 0 var(--mat-sys-corner-small) var(--mat-sys-corner-small) 0;
      font: var(--mat-sys-body-medium);
      max-width: 90ch;
    }
    .reading-tag {
      font: var(--mat-sys-label-small);
      text-transform: uppercase;
      letter-spacing: 0.08em;
      color: var(--mat-sys-on-surface-variant);
      margin-right: 8px;
    }
  `,
})
export class ResultPanel {
  readonly panel = input.required<string>();
  readonly title = input.required<string>();
  readonly icon = input('analytics');
  readonly reading = input('');
}
