import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { type Subscription, interval, switchMap } from 'rxjs';
import { ApiError } from '../core/api-error';
import { StudyApi } from '../studies/study-api';
import { StudyStore } from '../studies/study-store';
import { IMPORT_ERROR_LABELS, type ImportPreview } from '../studies/study-types';
import { describeChanges, importTargets } from './import-targets';

type Phase = 'choose' | 'uploading' | 'preview' | 'committing' | 'done';

/** Upload → map columns → preview with row errors → commit all-or-nothing. Nothing is written before commit. */
@Component({
  selector: 'sm-run-import',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatProgressBarModule, MatSelectModule],
  templateUrl: './run-import.html',
  styleUrl: './run-import.scss',
})
export class RunImport {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly phase = signal<Phase>('choose');
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly mapping = signal<Record<string, string>>({});
  protected readonly error = signal<string | null>(null);
  /** Upload share (0–100) while the file travels; then the server's own progress if it reports one. */
  protected readonly percent = signal<number | null>(null);
  protected readonly progressText = signal('');
  protected readonly result = signal<{ runs: number; values: number } | null>(null);
  protected readonly kindLabels = IMPORT_ERROR_LABELS;
  protected readonly describe = describeChanges;
  protected readonly targets = computed(() => importTargets(this.store.study()?.factors ?? [], this.store.study()?.responses ?? []));
  protected readonly mappingChanged = computed(() => {
    const p = this.preview();
    return !!p && Object.entries(this.mapping()).some(([h, t]) => (p.mapping.columns[h] ?? 'ignore') !== t);
  });
  private polling: Subscription | null = null;

  constructor() {
    this.destroyRef.onDestroy(() => this.polling?.unsubscribe());
  }

  private watch(operationId: string, phase: string): void {
    this.polling?.unsubscribe();
    this.polling = interval(700)
      .pipe(switchMap(() => this.api.operation(operationId)))
      .subscribe((op) => {
        if (!op) return;
        this.percent.set(op.percent);
        this.progressText.set(`${phase}: ${op.phase}${op.total ? ` — ${op.done} of ${op.total} rows` : ''}`);
      });
  }

  private stopWatching(): void {
    this.polling?.unsubscribe();
    this.polling = null;
    this.percent.set(null);
    this.progressText.set('');
  }

  protected upload(input: HTMLInputElement): void {
    const id = this.store.id();
    const file = input.files?.[0];
    if (id === null || !file) return;
    const old = this.preview();
    if (old && old.status === 'preview') this.api.discardImport(id, old.id).subscribe();
    const operationId = crypto.randomUUID();
    this.phase.set('uploading');
    this.error.set(null);
    this.result.set(null);
    this.percent.set(0);
    this.progressText.set(`Sending ${file.name}`);
    this.api.uploadImport(id, file, operationId).subscribe({
      next: (event) => {
        if (event.type === HttpEventType.UploadProgress) {
          this.percent.set(event.total ? Math.round((100 * event.loaded) / event.total) : null);
          if (event.total && event.loaded >= event.total) {
            this.percent.set(null);
            this.progressText.set('Checking every row…');
            this.watch(operationId, 'Checking');
          }
        } else if (event.type === HttpEventType.Response && event.body) {
          this.stopWatching();
          input.value = '';
          this.show(event.body.import);
        }
      },
      error: (e: unknown) => {
        this.stopWatching();
        input.value = '';
        this.phase.set(this.preview() ? 'preview' : 'choose');
        this.error.set(e instanceof ApiError ? e.message : 'The file could not be read.');
      },
    });
  }

  private show(p: ImportPreview): void {
    this.preview.set(p);
    this.mapping.set({ ...Object.fromEntries(p.headers.map((h) => [h, 'ignore'])), ...p.mapping.columns });
    this.phase.set('preview');
  }

  protected setTarget(header: string, target: string): void {
    this.mapping.update((m) => ({ ...m, [header]: target }));
  }

  protected applyMapping(): void {
    const id = this.store.id();
    const p = this.preview();
    if (id === null || !p) return;
    this.error.set(null);
    this.api.remapImport(id, p.id, this.mapping()).subscribe({
      next: (next) => this.show(next),
      error: (e: unknown) => this.error.set(e instanceof ApiError ? e.message : 'The mapping was not accepted.'),
    });
  }

  protected commit(): void {
    const id = this.store.id();
    const p = this.preview();
    if (id === null || !p || p.errorCount > 0) return;
    const operationId = crypto.randomUUID();
    this.phase.set('committing');
    this.progressText.set('Writing all rows in one transaction…');
    this.watch(operationId, 'Writing');
    this.api.commitImport(id, p.id, operationId).subscribe({
      next: (res) => {
        this.stopWatching();
        this.preview.set(res.import);
        this.result.set(res.changed);
        this.phase.set('done');
        this.store.reload();
      },
      error: (e: unknown) => {
        this.stopWatching();
        this.phase.set('preview');
        this.error.set(e instanceof ApiError ? `${e.message} Nothing was written.` : 'The import failed; nothing was written.');
      },
    });
  }

  protected discard(): void {
    const id = this.store.id();
    const p = this.preview();
    if (id !== null && p) this.api.discardImport(id, p.id).subscribe();
    this.reset();
  }

  protected reset(): void {
    this.preview.set(null);
    this.mapping.set({});
    this.result.set(null);
    this.error.set(null);
    this.phase.set('choose');
  }
}
