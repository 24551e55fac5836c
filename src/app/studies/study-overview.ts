import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { BACKWARD_TRANSITIONS, STATUS_LABELS, STUDY_STATUSES, type StudyStatus } from '../../../shared/studies';
import { ApiError } from '../core/api-error';
import { showServerErrors } from '../core/form-errors';
import { Notifier } from '../core/notifier';
import { ReasonDialog, type ReasonDialogData } from './reason-dialog';
import { StudyApi } from './study-api';
import { StudyFields } from './study-fields';
import { fillStudyForm, studyBody, studyForm } from './study-form';
import { StudyMembers } from './study-members';
import { StudyStore } from './study-store';

/** What each status means for the people in the lab; shown beside the workflow strip. */
const STATUS_HELP: Record<StudyStatus, string> = {
  draft: 'Set up factors and responses, then commit a plan.',
  planned: 'The runs exist; recording the first result starts collection.',
  collecting: 'Runs are being tested and recorded.',
  analysed: 'An analysis has been made; more runs can still be added by stepping back.',
  in_review: 'A reviewer is checking the analysis.',
  approved: 'Signed off. Re-opening needs a reason.',
};

@Component({
  selector: 'sm-study-overview',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatIconModule, StudyFields, StudyMembers],
  templateUrl: './study-overview.html',
  styleUrl: './study-overview.scss',
})
export class StudyOverview {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);

  protected readonly form = studyForm();
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly statuses = STUDY_STATUSES;
  protected readonly labels = STATUS_LABELS;
  protected readonly help = STATUS_HELP;
  protected readonly currentIndex = computed(() => STUDY_STATUSES.indexOf(this.store.study()?.status ?? 'draft'));
  protected readonly transitions = computed(() => {
    const s = this.store.study();
    if (!s) return [];
    return s.allowedTransitions.map((to) => ({ to, backward: BACKWARD_TRANSITIONS.includes(`${s.status}>${to}`) }));
  });

  constructor() {
    // Refill the form whenever a newer version of the study arrives (after a save, or a reload).
    effect(() => {
      const s = this.store.study();
      if (!s) return;
      untracked(() => {
        fillStudyForm(this.form, s);
        if (this.store.canEdit()) this.form.enable();
        else this.form.disable();
      });
    });
  }

  protected save(): void {
    const s = this.store.study();
    this.form.markAllAsTouched();
    if (!s || this.form.invalid) return;
    this.busy.set(true);
    this.error.set(null);
    this.api.patch(s.id, { ...studyBody(this.form), version: s.version }).subscribe({
      next: (study) => {
        this.busy.set(false);
        this.store.set(study);
        this.notifier.info('Study saved');
      },
      error: (e: unknown) => {
        this.busy.set(false);
        if (!(e instanceof ApiError)) return;
        if (e.status === 409) {
          this.error.set(`${e.message} Someone else saved this study after you opened it; their version is shown now — make your change again.`);
          this.store.reload();
        } else if (!showServerErrors(this.form, e)) this.error.set(e.message);
      },
    });
  }

  protected changeStatus(to: StudyStatus, backward: boolean): void {
    const s = this.store.study();
    if (!s) return;
    const data: ReasonDialogData = {
      title: `Move to “${STATUS_LABELS[to]}”`,
      message: backward
        ? `This steps the study back from “${STATUS_LABELS[s.status]}” to “${STATUS_LABELS[to]}”. Say why; the reason is audited.`
        : `The study moves from “${STATUS_LABELS[s.status]}” to “${STATUS_LABELS[to]}”.`,
      action: 'Change status',
      required: backward,
    };
    this.dialog
      .open<ReasonDialog, ReasonDialogData, string>(ReasonDialog, { data, width: '480px' })
      .afterClosed()
      .subscribe((reason) => {
        if (reason === undefined) return;
        this.api.patch(s.id, { status: to, version: s.version, ...(reason ? { reason } : {}) }).subscribe({
          next: (study) => this.store.set(study),
          error: (e: unknown) => {
            if (e instanceof ApiError) this.error.set(e.message);
            this.store.reload();
          },
        });
      });
  }
}
