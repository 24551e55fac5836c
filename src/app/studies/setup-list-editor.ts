import { Directive, effect, inject, signal, untracked } from '@angular/core';
import { FormArray, FormGroup, type AbstractControl } from '@angular/forms';
import type { Observable } from 'rxjs';
import type { ZodType } from 'zod';
import { ApiError } from '../core/api-error';
import { Notifier } from '../core/notifier';
import { applySchema, setupError } from './setup-forms';
import { StudyApi } from './study-api';
import { StudyStore } from './study-store';
import type { StudyDetail } from './study-types';

/**
 * What the factors, responses and outcomes editors share: a form array filled from the study, kept
 * when another tab's save reloads the study while this form has unsaved edits, checked against the
 * same zod schema the server uses, saved with one PUT, then refilled from the reloaded study.
 */
@Directive()
export abstract class SetupListEditor<G extends AbstractControl, Body> {
  protected readonly store = inject(StudyStore);
  protected readonly api = inject(StudyApi);
  private readonly notifier = inject(Notifier);
  protected readonly list = new FormArray<G>([]);
  protected readonly root: FormGroup;
  protected readonly problems = signal<string[]>([]);
  protected readonly busy = signal(false);
  protected readonly err = setupError;
  /** Set after our own save: the reload must refill this form even though it was edited. */
  private refillNext = false;

  /** Rows of the study this editor shows, as form groups. */
  protected abstract groupsOf(study: StudyDetail): G[];
  /** A new, empty row. */
  protected abstract blank(): G;
  /** The request body from the form. */
  protected abstract bodyOf(list: FormArray<G>): Body;
  /** The PUT that saves it. */
  protected abstract put(studyId: number, body: Body): Observable<unknown>;

  /**
   * @param key the body field the rows go in (also the form array's name, so that the server's
   *   detail paths like "factors.1.symbol" land on the right control)
   * @param schema the shared zod schema of the body
   * @param what plural noun for messages ("Factors saved")
   */
  constructor(
    key: string,
    private readonly schema: ZodType<Body>,
    private readonly what: string,
  ) {
    this.root = new FormGroup({ [key]: this.list });
    effect(() => {
      const s = this.store.study();
      // Another tab's save reloads the study too; unsaved edits here must survive that.
      if (!s || (untracked(() => this.root.dirty) && !this.refillNext)) return;
      this.refillNext = false;
      untracked(() => {
        this.list.clear();
        for (const g of this.groupsOf(s)) this.list.push(g);
        this.applyAccess();
        this.root.markAsPristine();
      });
    });
  }

  /** Viewers get a read-only form; subclasses may lock more. */
  protected applyAccess(): void {
    if (this.store.canEdit()) this.root.enable();
    else this.root.disable();
  }

  protected add(): void {
    this.list.push(this.blank());
    this.root.markAsDirty();
  }

  protected remove(i: number): void {
    this.list.removeAt(i);
    this.root.markAsDirty();
  }

  protected save(): void {
    const id = this.store.id();
    this.root.markAllAsTouched();
    this.problems.set([]);
    if (id === null || this.list.invalid) return;
    const body = this.bodyOf(this.list);
    const check = applySchema(this.schema, body, this.root);
    this.problems.set(check.unplaced);
    if (!check.ok) return;
    this.busy.set(true);
    this.put(id, body).subscribe({
      next: () => {
        this.busy.set(false);
        this.refillNext = true;
        this.notifier.info(`${this.what} saved`);
        this.store.reload();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        if (e instanceof ApiError) this.problems.set([e.message, ...e.details.map((d) => `${d.path}: ${d.message}`)]);
      },
    });
  }
}
