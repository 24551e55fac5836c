import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink } from '@angular/router';
import { debounceTime, distinctUntilChanged } from 'rxjs';
import { STATUS_LABELS, STUDY_STATUSES, type StudyListQuery, type StudyStatus } from '../../../shared/studies';
import { AuthStore } from '../auth/auth-store';
import { StatusChip } from './status-chip';
import { StudyApi } from './study-api';
import { StudyCreateDialog } from './study-create-dialog';
import type { StudyDetail, StudySummary } from './study-types';

type SortKey = StudyListQuery['sort'];

/** The studies the signed-in user is a member of (all, for admins): search, filters, sort, progress. */
@Component({
  selector: 'sm-study-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
    MatTooltipModule,
    StatusChip,
  ],
  templateUrl: './study-list.html',
  styleUrl: './study-list.scss',
})
export class StudyList {
  private readonly api = inject(StudyApi);
  private readonly auth = inject(AuthStore);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);

  protected readonly statuses = STUDY_STATUSES;
  protected readonly statusLabels = STATUS_LABELS;
  protected readonly sortChoices: { value: SortKey; label: string }[] = [
    { value: 'updated', label: 'Last changed' },
    { value: 'created', label: 'Created' },
    { value: 'title', label: 'Title' },
    { value: 'status', label: 'Status' },
  ];
  protected readonly columns = ['title', 'material', 'owner', 'status', 'progress', 'updated'];

  protected readonly search = new FormControl('', { nonNullable: true });
  protected readonly status = signal<StudyStatus | ''>('');
  protected readonly ownerId = signal<number | ''>('');
  protected readonly sort = signal<SortKey>('updated');
  protected readonly dir = signal<'asc' | 'desc'>('desc');
  private readonly q = toSignal(this.search.valueChanges.pipe(debounceTime(250), distinctUntilChanged()), { initialValue: '' });

  private readonly query = computed<Partial<StudyListQuery>>(() => ({
    q: this.q().trim() || undefined,
    status: this.status() || undefined,
    ownerId: this.ownerId() || undefined,
    sort: this.sort(),
    dir: this.dir(),
  }));
  protected readonly studies = rxResource({ params: () => this.query(), stream: ({ params }) => this.api.list(params) });
  protected readonly rows = computed(() => (this.studies.hasValue() ? this.studies.value() : []));
  /** Owners seen so far, so narrowing the list does not make the owner filter forget the others. */
  private readonly ownersSeen = signal(new Map<number, string>());
  protected readonly owners = computed(() => [...this.ownersSeen().entries()].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name)));
  protected readonly filtered = computed(() => this.query().q !== undefined || this.status() !== '' || this.ownerId() !== '');
  protected readonly canCreate = computed(() => this.auth.role() === 'engineer');
  protected readonly userName = computed(() => this.auth.user()?.name ?? '');

  constructor() {
    effect(() => {
      const rows = this.rows();
      const next = new Map(untracked(this.ownersSeen));
      let grew = false;
      for (const s of rows) {
        if (!next.has(s.owner.id)) {
          next.set(s.owner.id, s.owner.name);
          grew = true;
        }
      }
      if (grew) this.ownersSeen.set(next);
    });
  }

  protected percent(s: StudySummary): number {
    return s.progress.planned === 0 ? 0 : Math.round((100 * s.progress.recorded) / s.progress.planned);
  }

  protected toggleDir(): void {
    this.dir.update((d) => (d === 'asc' ? 'desc' : 'asc'));
  }

  protected clearFilters(): void {
    this.search.setValue('');
    this.status.set('');
    this.ownerId.set('');
  }

  protected openCreate(): void {
    this.dialog
      .open<StudyCreateDialog, void, StudyDetail>(StudyCreateDialog, { width: '640px', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((study) => {
        if (study) void this.router.navigate(['/studies', study.id, 'setup']);
      });
  }
}
