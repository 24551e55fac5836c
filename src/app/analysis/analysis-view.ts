import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { AnalysisDetail, StoredResult } from '../../../shared/analysis';
import { Notifier } from '../core/notifier';
import { CommentsPanel } from '../review/comments-panel';
import { RecommendationForm } from '../review/recommendation-form';
import { ReviewApi } from '../review/review-api';
import { type ReviewerChoice, ReviewRequest } from '../review/review-request';
import { SignOff } from '../review/sign-off';
import { StudyStore } from '../studies/study-store';
import { routeStudyId } from './study-route';
import { AnalysisApi } from './analysis-api';
import { factorNames, responseLabel } from './analysis-labels';
import { AnalysisResults } from './analysis-results';
import { formatWhen } from './format';
import { RunCounts } from './run-counts';
import { StaleBanner } from './stale-banner';
import { StatusChip } from './status-chip';

/**
 * One saved analysis: its stored (frozen) result, never recomputed; freshness against today's data;
 * review, discussion, sign-off, the recommendation and the report.
 */
@Component({
  selector: 'sm-analysis-view',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule, MatIconModule, AnalysisResults, RunCounts, StaleBanner, StatusChip, CommentsPanel, ReviewRequest, SignOff, RecommendationForm],
  templateUrl: './analysis-view.html',
  styleUrl: './analysis-view.scss',
})
export class AnalysisView {
  private readonly api = inject(AnalysisApi);
  private readonly reviewApi = inject(ReviewApi);
  private readonly notifier = inject(Notifier);
  /** The study page around this tab: its header shows the study status, which review and sign-off change. */
  private readonly studyStore = inject(StudyStore, { optional: true });
  /** route parameter :aid (the study's :id belongs to the parent route) */
  readonly aid = input.required<string>();
  protected readonly studyId = routeStudyId();
  protected readonly analysisId = computed(() => Number(this.aid()));

  protected readonly analysis = rxResource({ params: () => this.analysisId(), stream: ({ params }) => this.api.get(params) });
  protected readonly study = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.study(params) });
  protected readonly threads = rxResource({ params: () => this.analysisId(), stream: ({ params }) => this.reviewApi.threads(params) });
  private readonly settings = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.runSettings(params) });
  protected readonly recommendation = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.recommendation(params) });

  protected readonly a = computed<AnalysisDetail | undefined>(() => (this.analysis.hasValue() ? this.analysis.value() : undefined));
  protected readonly bundle = computed<StoredResult | null>(() => {
    const a = this.a();
    return a ? { engine: a.result, counts: a.counts, summary: a.summary, readings: a.readings, rowCodes: a.rowCodes, posthoc: a.posthoc } : null;
  });
  protected readonly rowSettings = computed(() => (this.settings.hasValue() ? this.settings.value() : null));
  protected readonly names = computed(() => factorNames(this.study.value()));
  protected readonly responseLabel = computed(() => responseLabel(this.study.value(), this.a()?.spec.response ?? ''));
  protected readonly threadList = computed(() => (this.threads.hasValue() ? this.threads.value() : []));
  protected readonly commentCounts = computed(() => {
    const counts: Record<string, number> = {};
    for (const t of this.threadList()) if (t.resolvedAt === null) counts[t.anchor] = (counts[t.anchor] ?? 0) + 1 + t.replies.length;
    return counts;
  });
  protected readonly reviewers = computed<ReviewerChoice[]>(() =>
    (this.study.value()?.members ?? []).filter((m) => m.role === 'reviewer').map((m) => ({ userId: m.userId, name: m.name, accountRole: m.accountRole })),
  );
  protected readonly mayRecommend = computed(() => {
    const a = this.a();
    const role = this.study.value()?.myRole;
    return a?.status === 'approved' && !a.stale && (role === 'owner' || role === 'contributor');
  });
  protected readonly reportHtml = computed(() => `/api/analyses/${this.analysisId()}/report.html`);
  protected readonly reportPdf = computed(() => `/api/analyses/${this.analysisId()}/report.pdf`);
  protected readonly when = formatWhen;

  protected readonly anchor = signal('analysis');
  protected readonly focusRequest = signal(0);

  protected commentOn(anchor: string): void {
    this.anchor.set(anchor);
    this.focusRequest.update((n) => n + 1);
  }

  protected reviewRequested(mailed: number): void {
    this.notifier.info(`Review requested; ${mailed} e-mail${mailed === 1 ? '' : 's'} sent.`);
    this.analysis.reload();
    this.studyStore?.reload();
  }

  protected signed(a: AnalysisDetail): void {
    this.analysis.set(a);
    this.studyStore?.reload();
    this.notifier.info(a.status === 'approved' ? 'Analysis approved and frozen.' : 'Analysis returned to its author.');
  }

  protected recommended(): void {
    this.notifier.info('Recommended geometry recorded.');
    this.recommendation.reload();
  }
}
