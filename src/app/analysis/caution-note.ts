import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The standing caution on every page that shows statistics someone might act on. */
@Component({
  selector: 'sm-caution-note',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    <p class="sm-note sm-note-caution" role="note" data-testid="caution">
      <mat-icon>gavel</mat-icon>
      <span>
        Statistics inform; they do not replace qualified engineering judgement, the applicable test standards, or local codes
        and licensed practice.
      </span>
    </p>
  `,
})
export class CautionNote {}
