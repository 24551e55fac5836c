import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { AuthStore } from '../auth/auth-store';

/** Where a role guard sends a signed-in user whose role may not open the page they asked for. */
@Component({
  selector: 'sm-not-allowed',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule, MatIconModule],
  template: `
    <section class="sm-page">
      <div class="sm-note sm-note-caution" role="alert" data-testid="not-allowed">
        <mat-icon>block</mat-icon>
        <div>
          <strong>Not allowed.</strong>
          Your role ({{ roleLabel() }}) may not open
          @if (page()) {
            <code>{{ page() }}</code>.
          } @else {
            that page.
          }
          If you need it, ask an administrator to change your role.
        </div>
      </div>
      <a mat-flat-button routerLink="/studies">Go to studies</a>
    </section>
  `,
})
export class NotAllowed {
  /** The page that was refused (query parameter). */
  readonly page = input<string>();
  protected readonly roleLabel = inject(AuthStore).roleLabel;
}
