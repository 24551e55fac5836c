import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { debounceTime, map, of } from 'rxjs';
import { StudyApi } from '../studies/study-api';
import { StudyStore } from '../studies/study-store';
import { AuditTable } from './audit-table';

const ENTITIES = ['study', 'member', 'factor', 'response', 'outcome', 'plan', 'run', 'import', 'attachment', 'analysis'];
const ACTIONS = ['create', 'update', 'delete', 'status', 'remove', 'restore', 'upload', 'commit', 'discard', 'owner'];

/** The study's audit trail: every change with who, when, old, new and why; filterable; CSV download. */
@Component({
  selector: 'sm-study-audit',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatPaginatorModule, MatProgressBarModule, MatSelectModule, AuditTable],
  template: `
    <section class="sm-panel">
      <form class="filters" [formGroup]="filters" aria-label="Audit filters">
        <mat-form-field appearance="outline">
          <mat-label>What changed</mat-label>
          <mat-select formControlName="entity">
            <mat-option value="">Anything</mat-option>
            @for (e of entities; track e) {
              <mat-option [value]="e">{{ e }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Action</mat-label>
          <mat-select formControlName="action">
            <mat-option value="">Any action</mat-option>
            @for (a of actions; track a) {
              <mat-option [value]="a">{{ a }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Field</mat-label>
          <input matInput formControlName="field" placeholder="e.g. values.H" />
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Who</mat-label>
          <mat-select formControlName="userId">
            <mat-option value="">Anyone</mat-option>
            @for (m of members(); track m.userId) {
              <mat-option [value]="'' + m.userId">{{ m.name }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>From</mat-label>
          <input matInput type="date" formControlName="from" />
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>To (inclusive)</mat-label>
          <input matInput type="date" formControlName="to" />
        </mat-form-field>
        <span class="spacer"></span>
        <button mat-button type="button" (click)="filters.reset()">Clear filters</button>
        <a mat-stroked-button [href]="csvUrl()" download data-testid="audit-csv"><mat-icon>download</mat-icon> CSV of these rows</a>
      </form>
      @if (audit.isLoading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the audit trail" />
      }
      <sm-audit-table [events]="events()" data-testid="audit-table" />
      <mat-paginator [length]="total()" [pageSize]="pageSize" [pageIndex]="page()" [hidePageSize]="true" (page)="turn($event)" aria-label="Audit pages" />
    </section>
  `,
  styles: `
    .filters {
      display: flex;
      flex-wrap: wrap;
      gap: 0 12px;
      align-items: baseline;
      mat-form-field {
        width: 170px;
      }
    }
    .spacer {
      flex: 1;
    }
  `,
})
export class StudyAudit {
  private readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  protected readonly entities = ENTITIES;
  protected readonly actions = ACTIONS;
  protected readonly pageSize = 100;
  protected readonly members = computed(() => this.store.study()?.members ?? []);
  protected readonly filters = new FormGroup({
    entity: new FormControl('', { nonNullable: true }),
    action: new FormControl('', { nonNullable: true }),
    field: new FormControl('', { nonNullable: true }),
    userId: new FormControl('', { nonNullable: true }),
    from: new FormControl('', { nonNullable: true }),
    to: new FormControl('', { nonNullable: true }),
  });
  protected readonly page = signal(0);
  private readonly values = toSignal(
    this.filters.valueChanges.pipe(
      debounceTime(250),
      map(() => {
        this.page.set(0);
        return this.filters.getRawValue();
      }),
    ),
    { initialValue: this.filters.getRawValue() },
  );
  /** Dates are whole days in the user's time zone: "to" includes the whole of that day. */
  private readonly query = computed(() => {
    const v = this.values();
    const day = (d: string, end: boolean) => (d ? String(new Date(`${d}T${end ? '23:59:59.999' : '00:00:00'}`).getTime()) : undefined);
    return { entity: v.entity, action: v.action, field: v.field.trim(), userId: v.userId, from: day(v.from, false), to: day(v.to, true) };
  });
  protected readonly audit = rxResource({
    params: () => ({ id: this.store.id(), q: this.query(), offset: this.page() * this.pageSize }),
    stream: ({ params }) => (params.id === null ? of({ events: [], total: 0 }) : this.api.audit(params.id, { ...params.q, limit: this.pageSize, offset: params.offset })),
  });
  protected readonly events = computed(() => (this.audit.hasValue() ? this.audit.value().events : []));
  protected readonly total = computed(() => (this.audit.hasValue() ? this.audit.value().total : 0));
  protected readonly csvUrl = computed(() => this.api.auditCsvUrl(this.store.id() ?? 0, this.query()));

  protected turn(e: PageEvent): void {
    this.page.set(e.pageIndex);
  }
}
