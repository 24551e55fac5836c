import { ChangeDetectionStrategy, Component, effect, inject, input, numberAttribute } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTabsModule } from '@angular/material/tabs';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { StatusChip } from './status-chip';
import { StudyStore } from './study-store';

const TABS = [
  { path: 'overview', label: 'Overview', icon: 'info' },
  { path: 'setup', label: 'Set-up', icon: 'tune' },
  { path: 'plan', label: 'Plan', icon: 'grid_view' },
  { path: 'runs', label: 'Run sheet', icon: 'table_chart' },
  { path: 'import', label: 'Import', icon: 'upload_file' },
  { path: 'analysis', label: 'Analysis', icon: 'query_stats' },
  { path: 'analyses', label: 'Saved analyses', icon: 'fact_check' },
  { path: 'audit', label: 'Audit trail', icon: 'history' },
] as const;

/** One study: its title and progress on top, tabs for each step of the work below. */
@Component({
  selector: 'sm-study-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [StudyStore],
  imports: [RouterOutlet, RouterLink, RouterLinkActive, MatTabsModule, MatIconModule, MatButtonModule, MatProgressBarModule, StatusChip],
  template: `
    <section class="sm-page wide">
      <a mat-button routerLink="/studies" class="back"><mat-icon>arrow_back</mat-icon> All studies</a>
      @if (store.study(); as s) {
        <header class="head">
          <div>
            <h1 class="sm-page-title" data-testid="study-title">{{ s.title }}</h1>
            <p class="meta">
              <sm-status-chip [status]="s.status" />
              <span>{{ s.progress.recorded }} of {{ s.progress.planned }} runs recorded</span>
              @if (s.progress.invalid > 0) {
                <span class="invalid">{{ s.progress.invalid }} invalid (excluded from analysis)</span>
              }
              @if (s.approval?.dataChanged) {
                <a class="changed" data-testid="changed-since-approval" [routerLink]="['analyses', s.approval!.analysisId]" title="The signed-off analysis no longer matches the run sheet: open it to see what changed">
                  <mat-icon inline>warning</mat-icon> Data changed since approval
                </a>
              }
              <span>Your role: {{ s.myRole }}</span>
              @if (!store.canEdit()) {
                <span class="readonly"><mat-icon inline>visibility</mat-icon> Read only</span>
              }
            </p>
          </div>
        </header>
        <nav mat-tab-nav-bar [tabPanel]="panel" aria-label="Study sections">
          @for (tab of tabs; track tab.path) {
            <a mat-tab-link [routerLink]="tab.path" routerLinkActive #rla="routerLinkActive" [active]="rla.isActive" [attr.data-tab]="tab.path">
              <mat-icon class="tab-icon">{{ tab.icon }}</mat-icon>{{ tab.label }}
            </a>
          }
        </nav>
        <mat-tab-nav-panel #panel>
          <div class="tab-body"><router-outlet /></div>
        </mat-tab-nav-panel>
      } @else if (store.error()) {
        <div class="sm-note sm-note-error" role="alert"><mat-icon>error</mat-icon> This study cannot be opened: it does not exist or you are not a member.</div>
      } @else {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the study" />
      }
    </section>
  `,
  styles: `
    .wide {
      max-width: 1400px;
    }
    .back {
      margin: -8px 0 8px -12px;
    }
    .head {
      margin-bottom: 12px;
    }
    .meta {
      display: flex;
      flex-wrap: wrap;
      gap: 8px 16px;
      align-items: center;
      margin: 8px 0 0;
      color: var(--mat-sys-on-surface-variant);
    }
    .invalid,
    .changed {
      color: var(--mat-sys-error);
    }
    .readonly {
      display: inline-flex;
      gap: 4px;
      align-items: center;
    }
    /* Eight steps have to fit one row at laptop width; Material's default 24px side padding pushes them into paging. */
    a[mat-tab-link] {
      padding: 0 12px;
      min-width: 0;
    }
    .tab-icon {
      margin-right: 4px;
      font-size: 20px;
      width: 20px;
      height: 20px;
    }
    .tab-body {
      padding-top: 20px;
    }
  `,
})
export class StudyPage {
  protected readonly store = inject(StudyStore);
  protected readonly tabs = TABS;
  /** From the route (:id), bound by withComponentInputBinding. */
  readonly id = input.required({ transform: numberAttribute });

  constructor() {
    effect(() => this.store.id.set(this.id()));
  }
}
