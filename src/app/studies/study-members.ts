import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, FormGroupDirective, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import { of } from 'rxjs';
import { STUDY_ROLES, type StudyRole } from '../../../shared/roles';
import { StudyApi } from './study-api';
import { StudyStore } from './study-store';

const ROLE_HELP: Record<StudyRole, string> = {
  owner: 'runs the study (engineer)',
  contributor: 'records and edits runs (engineer)',
  reviewer: 'reviews the analysis (statistician or supervisor)',
  viewer: 'reads everything, changes nothing',
};

/** Who belongs to the study; the owner (or an admin) adds, re-roles and removes members. */
@Component({
  selector: 'sm-study-members',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatSelectModule, MatTooltipModule],
  template: `
    <h2 class="section">Members</h2>
    <ul class="members" aria-label="Study members">
      @for (m of members(); track m.userId) {
        <li>
          <mat-icon aria-hidden="true">person</mat-icon>
          <span class="who">{{ m.name }} <span class="sub">{{ m.email }}</span></span>
          <span class="role">{{ m.role }}</span>
          @if (store.canManageMembers() && m.role !== 'owner') {
            <button mat-icon-button (click)="remove(m.userId)" [attr.aria-label]="'Remove ' + m.name + ' from the study'" matTooltip="Remove from the study">
              <mat-icon>person_remove</mat-icon>
            </button>
          }
        </li>
      }
    </ul>
    @if (store.canManageMembers()) {
      <form class="add" [formGroup]="form" #f="ngForm" (ngSubmit)="add(f)">
        <mat-form-field appearance="outline">
          <mat-label>Person</mat-label>
          <mat-select [formControl]="userId" name="member">
            @for (u of candidates(); track u.id) {
              <mat-option [value]="u.id">{{ u.name }} ({{ u.role }})</mat-option>
            } @empty {
              <mat-option disabled [value]="0">Everyone is already a member</mat-option>
            }
          </mat-select>
          <mat-error>Choose who to add</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Study role</mat-label>
          <mat-select [formControl]="role" name="memberRole">
            <mat-select-trigger>{{ role.value }}</mat-select-trigger>
            @for (r of roles; track r) {
              <mat-option [value]="r">{{ r }} — {{ help[r] }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <button mat-stroked-button type="submit" [disabled]="busy()"><mat-icon>person_add</mat-icon> Add member</button>
      </form>
    }
  `,
  styles: `
    .section {
      font: var(--mat-sys-title-medium);
      margin: 0 0 8px;
    }
    .members {
      list-style: none;
      padding: 0;
      margin: 0 0 12px;
      li > mat-icon {
        flex: none;
      }
      li {
        display: flex;
        gap: 12px;
        align-items: center;
        padding: 4px 0;
        border-bottom: 1px solid var(--mat-sys-outline-variant);
      }
    }
    .who {
      flex: 1;
      min-width: 0;
      overflow-wrap: anywhere;
    }
    .sub {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      margin-left: 6px;
    }
    .role {
      font: var(--mat-sys-label-large);
    }
    .add {
      display: flex;
      flex-wrap: wrap;
      gap: 0 12px;
      align-items: baseline;
    }
  `,
})
export class StudyMembers {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  protected readonly roles = STUDY_ROLES;
  protected readonly help = ROLE_HELP;
  protected readonly members = computed(() => this.store.study()?.members ?? []);
  protected readonly busy = signal(false);
  private readonly candidatesRes = rxResource({
    params: () => (this.store.canManageMembers() ? { id: this.store.id(), n: this.members().length } : undefined),
    stream: ({ params }) => (params?.id ? this.api.candidates(params.id) : of([])),
  });
  protected readonly candidates = computed(() => (this.candidatesRes.hasValue() ? this.candidatesRes.value() : []));
  protected readonly userId = new FormControl(0, { nonNullable: true, validators: [Validators.min(1)] });
  protected readonly role = new FormControl<StudyRole>('viewer', { nonNullable: true });
  protected readonly form = new FormGroup({ userId: this.userId, role: this.role });

  protected add(f: FormGroupDirective): void {
    const id = this.store.id();
    this.userId.markAsTouched();
    if (id === null || this.userId.invalid) return;
    this.busy.set(true);
    this.api.addMember(id, this.userId.value, this.role.value).subscribe({
      next: () => {
        this.busy.set(false);
        // resetForm also clears "submitted", so the emptied person field is not shown as an error.
        f.resetForm({ userId: 0, role: this.role.value });
        this.store.reload();
      },
      error: () => this.busy.set(false),
    });
  }

  protected remove(userId: number): void {
    const id = this.store.id();
    if (id === null) return;
    this.api.removeMember(id, userId).subscribe(() => this.store.reload());
  }
}
