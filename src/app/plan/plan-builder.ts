import { DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { debounceTime, map } from 'rxjs';
import { ApiError } from '../core/api-error';
import { Notifier } from '../core/notifier';
import { ReasonDialog, type ReasonDialogData } from '../studies/reason-dialog';
import { StudyApi } from '../studies/study-api';
import { StudyStore } from '../studies/study-store';
import { fillPlanForm, planForm, toPlanBody } from './plan-form';

const PREVIEW_ROWS = 40;

/** Design choice, replicates, blocks, randomisation and power — previewed live, committed on purpose. */
@Component({
  selector: 'sm-plan-builder',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DecimalPipe,
    PercentPipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
  ],
  templateUrl: './plan-builder.html',
  styleUrl: './plan-builder.scss',
})
export class PlanBuilder {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  protected readonly form = planForm();
  private readonly value = toSignal(this.form.valueChanges.pipe(debounceTime(300), map(() => this.form.getRawValue())), {
    initialValue: this.form.getRawValue(),
  });
  protected readonly check = computed(() => toPlanBody(this.value(), this.centreOnFull()));
  protected readonly generalErrors = computed(() => {
    const c = this.check();
    return c.ok ? [] : c.general;
  });
  protected readonly factors = computed(() => this.store.study()?.factors ?? []);
  protected readonly twoLevelOnly = computed(() => this.factors().every((f) => f.levels.length === 2));
  /** A full factorial takes centre points when every factor is numeric at two levels (the centre is their midpoint). */
  protected readonly centreOnFull = computed(() => this.factors().length > 0 && this.factors().every((f) => f.kind === 'numeric' && f.levels.length === 2));

  protected readonly preview = rxResource({
    params: () => {
      const c = this.check();
      const s = this.store.study();
      if (!c.ok || !s || s.factors.length === 0) return undefined;
      // The set-up version is part of the key: a factor edited on the Set-up tab changes the preview.
      return { id: s.id, body: c.body, setup: s.updatedAt };
    },
    stream: ({ params }) => this.api.previewPlan(params.id, params.body),
  });
  protected readonly shown = computed(() => (this.preview.hasValue() ? this.preview.value() : null));
  protected readonly previewRuns = computed(() => this.shown()?.runs.slice(0, PREVIEW_ROWS) ?? []);
  protected readonly previewError = computed(() => {
    const e = this.preview.error();
    return e instanceof ApiError ? e.message : e ? 'The preview failed; check the values above.' : null;
  });
  protected readonly refusal = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly previewRows = PREVIEW_ROWS;

  constructor() {
    // Start from the committed plan, once, so re-opening the tab shows what was decided.
    let filled = false;
    effect(() => {
      const spec = this.store.study()?.plan?.spec;
      if (filled || !this.store.study()) return;
      filled = true;
      untracked(() => {
        if (spec) fillPlanForm(this.form, spec);
        if (!this.store.canEdit()) this.form.disable();
      });
    });
  }

  protected error(field: keyof ReturnType<typeof this.form.getRawValue>): string | null {
    const c = this.check();
    return c.ok ? null : (c.errors[field] ?? null);
  }

  protected commit(): void {
    const s = this.store.study();
    const c = this.check();
    if (!s || !c.ok) return;
    this.refusal.set(null);
    const existing = s.progress.planned + s.progress.removed;
    if (existing === 0) {
      this.send(s.id);
      return;
    }
    const data: ReasonDialogData = {
      title: 'Replace the plan?',
      message: `The study already has ${existing} runs. Committing replaces them with the ${this.shown()?.runCount ?? 'new'} runs of this plan. This is refused if any run already holds results.`,
      action: 'Replace plan',
      destructive: true,
      required: false,
    };
    this.dialog
      .open<ReasonDialog, ReasonDialogData, string>(ReasonDialog, { data, width: '480px' })
      .afterClosed()
      .subscribe((reason) => {
        if (reason !== undefined) this.send(s.id);
      });
  }

  private send(id: number): void {
    const c = toPlanBody(this.form.getRawValue(), this.centreOnFull());
    if (!c.ok) return;
    this.busy.set(true);
    this.api.commitPlan(id, c.body).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.notifier.info(`Plan committed: ${res.runCount} runs`);
        this.store.reload();
        void this.router.navigate(['/studies', id, 'runs']);
      },
      error: (e: unknown) => {
        this.busy.set(false);
        if (e instanceof ApiError) this.refusal.set(e.message);
      },
    });
  }
}
