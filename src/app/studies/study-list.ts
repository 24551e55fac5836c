import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { AuthStore } from '../auth/auth-store';

/**
 * The studies page. Until the studies module lands it says so plainly instead of showing an empty
 * table that looks broken. (Replaced by the studies issue.)
 */
@Component({
  selector: 'sm-study-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    <section class="sm-page">
      <h1 class="sm-page-title">Studies</h1>
      <p class="sm-page-lead">Welcome, {{ userName() }}.</p>
      <div class="empty sm-panel" data-testid="studies-empty">
        <mat-icon class="empty-icon">science</mat-icon>
        <h2>No studies yet</h2>
        <p>
          Studies arrive with the studies module: there you will set up factors such as neck width ratio or
          notch-root radius, plan the runs, record responses and analyse them.
        </p>
      </div>
    </section>
  `,
  styles: `
    .empty {
      display: flex;
      flex-direction: column;
      align-items: center;
      text-align: center;
      padding: 48px 24px;
      border-style: dashed;
    }
    .empty-icon {
      width: 48px;
      height: 48px;
      font-size: 48px;
      color: var(--mat-sys-primary);
      margin-bottom: 12px;
    }
    h2 {
      font: var(--mat-sys-title-large);
      margin-bottom: 8px;
    }
    p {
      max-width: 52ch;
      margin: 0;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class StudyList {
  private readonly user = inject(AuthStore).user;
  protected readonly userName = computed(() => this.user()?.name ?? '');
}
