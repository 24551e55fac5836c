import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { routeStudyId } from './study-route';
import { AnalysisApi } from './analysis-api';
import { formatWhen } from './format';
import { StatusChip } from './status-chip';

/** The saved analyses of a study, newest first, with status and a STALE mark where the data changed since. */
@Component({
  selector: 'sm-saved-analyses',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule, MatIconModule, StatusChip],
  template: `
    <section class="tab-page">
      <div class="heading">
        <h2 class="sm-page-title">Saved analyses</h2>
        <span class="spacer"></span>
        <a mat-flat-button [routerLink]="['/studies', studyId(), 'analysis']"><mat-icon>query_stats</mat-icon>Open the workspace</a>
      </div>
      <p class="sm-page-lead">Each saved analysis keeps its model, its full result and a hash of the exact data it used.</p>
      @if (staleCount() > 0) {
        <p class="sm-note sm-note-error" role="alert" data-testid="stale-summary">
          <mat-icon>sync_problem</mat-icon>
          <span><b>STALE:</b> {{ staleCount() }} saved {{ staleCount() === 1 ? 'analysis no longer matches' : 'analyses no longer match' }} today's
            data. Open one to see what changed.</span>
        </p>
      }
      @if (list.error()) {
        <p class="sm-note sm-note-error"><mat-icon>error</mat-icon>The saved analyses could not be loaded.</p>
      }
      <ul class="list">
        @for (a of items(); track a.id) {
          <li class="sm-panel" [class.stale]="a.stale" [attr.data-analysis]="a.id">
            <div class="line">
              <a class="title" [routerLink]="['/studies', studyId(), 'analyses', a.id]">{{ a.title }}</a>
              <sm-status-chip [status]="a.status" [stale]="a.stale" />
            </div>
            <div class="meta">
              {{ a.spec.response }} · factors {{ a.spec.factors.join(', ') }} · Type {{ ['I', 'II', 'III'][a.spec.ssType - 1] }} · α {{ a.spec.alpha }} ·
              saved by {{ a.createdBy.name }}, {{ when(a.createdAt) }}
              @if (a.approvedBy) {
                · approved by {{ a.approvedBy.name }}, {{ when(a.approvedAt) }}
              }
            </div>
          </li>
        } @empty {
          @if (!list.isLoading()) {
            <li class="none">No saved analyses yet. Open the workspace, choose a model and save it.</li>
          }
        }
      </ul>
    </section>
  `,
  styles: `
    .heading {
      display: flex;
      align-items: center;
      gap: 12px;
    }
    .spacer {
      flex: 1;
    }
    .list {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      gap: 10px;
    }
    .list .sm-panel {
      padding: 14px 18px;
    }
    .list .stale {
      border: 2px solid var(--mat-sys-error);
    }
    .line {
      display: flex;
      align-items: center;
      gap: 12px;
      flex-wrap: wrap;
    }
    .title {
      font: var(--mat-sys-title-medium);
    }
    .meta {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      margin-top: 4px;
    }
    .none {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class SavedAnalyses {
  private readonly api = inject(AnalysisApi);
  protected readonly studyId = routeStudyId();
  protected readonly study = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.study(params) });
  protected readonly list = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.list(params) });
  protected readonly items = computed(() => (this.list.hasValue() ? this.list.value() : []));
  protected readonly staleCount = computed(() => this.items().filter((a) => a.stale).length);
  protected readonly when = formatWhen;
}
