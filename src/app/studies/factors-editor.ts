import { ChangeDetectionStrategy, Component, effect, inject, signal, untracked } from '@angular/core';
import { FormArray, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import { factorsBody } from '../../../shared/studies';
import { ApiError } from '../core/api-error';
import { Notifier } from '../core/notifier';
import { applySchema, factorGroup, factorsValue, levelGroup, setupError, type FactorGroup } from './setup-forms';
import { StudyApi } from './study-api';
import { StudyStore } from './study-store';

/** Factors and their levels. Once runs exist the design is fixed: symbols, kinds and level values lock. */
@Component({
  selector: 'sm-factors-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, MatTooltipModule],
  templateUrl: './factors-editor.html',
  styleUrl: './setup-editors.scss',
})
export class FactorsEditor {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  private readonly notifier = inject(Notifier);
  protected readonly list = new FormArray<FactorGroup>([]);
  protected readonly root = new FormGroup({ factors: this.list });
  protected readonly problems = signal<string[]>([]);
  protected readonly busy = signal(false);
  /** Set after our own save: the reload must refill this form even though it was edited. */
  private refillNext = false;
  protected readonly err = setupError;

  constructor() {
    effect(() => {
      const s = this.store.study();
      // Another tab's save reloads the study too; unsaved edits here must survive that.
      if (!s || (untracked(() => this.root.dirty) && !this.refillNext)) return;
      this.refillNext = false;
      untracked(() => this.fill());
    });
  }

  private fill(): void {
    const s = this.store.study();
    if (!s) return;
    this.list.clear();
    for (const f of s.factors) this.list.push(factorGroup(f));
    this.applyLocks();
    this.root.markAsPristine();
  }

  /** Viewers get a read-only form; once runs exist, only names, units, labels and tracking stay editable. */
  private applyLocks(): void {
    if (!this.store.canEdit()) {
      this.root.disable();
      return;
    }
    this.root.enable();
    if (!this.store.hasRuns()) return;
    for (const g of this.list.controls) {
      g.controls.symbol.disable();
      g.controls.kind.disable();
      for (const l of g.controls.levels.controls) l.controls.value.disable();
    }
  }

  protected addFactor(): void {
    this.list.push(factorGroup());
    this.root.markAsDirty();
  }

  protected removeFactor(i: number): void {
    this.list.removeAt(i);
    this.root.markAsDirty();
  }

  protected addLevel(f: FactorGroup): void {
    f.controls.levels.push(levelGroup());
    this.root.markAsDirty();
  }

  protected removeLevel(f: FactorGroup, i: number): void {
    f.controls.levels.removeAt(i);
    this.root.markAsDirty();
  }

  protected save(): void {
    const id = this.store.id();
    this.root.markAllAsTouched();
    this.problems.set([]);
    if (id === null || this.list.invalid) return;
    const body = factorsValue(this.list);
    const check = applySchema(factorsBody, body, this.root);
    this.problems.set(check.unplaced);
    if (!check.ok) return;
    this.busy.set(true);
    this.api.putFactors(id, body.factors).subscribe({
      next: () => {
        this.busy.set(false);
        this.refillNext = true;
        this.notifier.info('Factors saved');
        this.store.reload();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        if (e instanceof ApiError) this.problems.set([e.message, ...e.details.map((d) => `${d.path}: ${d.message}`)]);
      },
    });
  }
}
