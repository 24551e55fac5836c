import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { Router, RouterLink } from '@angular/router';

@Component({
  selector: 'sm-not-found',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule],
  template: `
    <section class="sm-page">
      <h1 class="sm-page-title">Page not found</h1>
      <p class="sm-page-lead">There is no page at <code>{{ url }}</code>. Check the address, or start again from the studies.</p>
      <a mat-flat-button routerLink="/studies">Go to studies</a>
    </section>
  `,
})
export class NotFound {
  protected readonly url = inject(Router).url;
}
