import { httpResource } from '@angular/common/http';
import { Injectable, computed, signal } from '@angular/core';
import { canEditStudy, canManageMembers, type StudyDetail } from './study-types';

/**
 * The study open in the study page, shared by its tabs (provided by StudyPage, so each open study
 * has its own). Tabs read `study()` and call `reload()` after they change something the header shows.
 */
@Injectable()
export class StudyStore {
  readonly id = signal<number | null>(null);
  private readonly resource = httpResource<{ study: StudyDetail }>(() => {
    const id = this.id();
    return id === null ? undefined : `/api/studies/${id}`;
  });

  readonly study = computed(() => (this.resource.hasValue() ? this.resource.value().study : null));
  readonly isLoading = this.resource.isLoading;
  readonly error = this.resource.error;
  readonly role = computed(() => this.study()?.myRole);
  /** Owners, contributors and admins change the study; reviewers and viewers read it. */
  readonly canEdit = computed(() => canEditStudy(this.role()));
  readonly canManageMembers = computed(() => canManageMembers(this.role()));
  /** Once the plan has made runs, the design (symbols, kinds, level values) is fixed on the server. */
  readonly hasRuns = computed(() => (this.study()?.progress.planned ?? 0) + (this.study()?.progress.removed ?? 0) > 0);

  reload(): void {
    this.resource.reload();
  }

  /** A mutation answered with the whole study: show it without another round trip. */
  set(study: StudyDetail): void {
    this.resource.set({ study });
  }
}
