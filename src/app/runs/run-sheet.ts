import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTooltipModule } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import { map, of } from 'rxjs';
import type { RunEdit } from '../../../shared/runs';
import { ApiError } from '../core/api-error';
import { Notifier } from '../core/notifier';
import { ReasonDialog, type ReasonDialogData } from '../studies/reason-dialog';
import { StudyApi } from '../studies/study-api';
import { StudyStore } from '../studies/study-store';
import type { Run } from '../studies/study-types';
import { AttachmentsDialog, type AttachmentsDialogData } from './attachments-dialog';
import { parseTsv } from './paste-parser';
import { planPaste } from './paste-plan';
import { cellChange, cellSpecs, cellText } from './run-cells';
import { runColumns } from './run-columns';
import { ConflictDialog, cellConflict, type ConflictChoice } from './run-conflict';
import { RunGrid, type CellEdit, type GridPaste, type RowActionKind } from './run-grid';
import { RunHistoryDialog, type RunHistoryData } from './run-history-dialog';
import { sheetCounts } from './sheet-counts';

/** The run sheet: one row per run, saved cell by cell, with block paste, files, history and removal. */
@Component({
  selector: 'sm-run-sheet',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, MatSlideToggleModule, MatTooltipModule, RunGrid],
  templateUrl: './run-sheet.html',
  styleUrl: './run-sheet.scss',
})
export class RunSheetPage {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly grid = viewChild(RunGrid);

  protected readonly includeRemoved = signal(false);
  private readonly sheet = rxResource({
    params: () => ({ id: this.store.id(), removed: this.includeRemoved() }),
    stream: ({ params }) => (params.id === null ? of(null) : this.api.runs(params.id, params.removed)),
  });
  protected readonly loading = this.sheet.isLoading;
  private readonly data = computed(() => (this.sheet.hasValue() ? this.sheet.value() : null));
  /** The rows shown; starts from each load and takes the server's answer after every save. */
  protected readonly runs = linkedSignal<Run[]>(() => this.data()?.runs ?? []);
  private readonly byId = computed(() => new Map(this.runs().map((r) => [r.id, r])));
  protected readonly counts = computed(() => {
    const local = sheetCounts(this.runs());
    // Removed runs are only loaded on request; until then the server's count stands for them.
    return this.includeRemoved() ? local : { ...local, removed: this.data()?.counts.removed ?? 0 };
  });
  private readonly outcomes = computed(() => this.data()?.outcomes ?? []);
  private readonly specs = computed(() => cellSpecs(this.data()?.factors ?? [], this.data()?.responses ?? []));
  protected readonly canEdit = this.store.canEdit;
  protected readonly columns = computed(() => {
    const d = this.data();
    return d ? runColumns(d.factors, d.responses, d.outcomes, this.canEdit()) : [];
  });
  protected readonly pasteErrors = signal<string[]>([]);
  protected readonly lastPaste = signal<{ message: string; undo: RunEdit[] | null } | null>(null);
  protected readonly busy = signal(false);

  protected exportUrl(format: 'csv' | 'xlsx' | 'html'): string {
    return this.api.exportUrl(this.store.id() ?? 0, format);
  }

  private replace(updated: Run[]): void {
    const next = new Map(updated.map((r) => [r.id, r]));
    this.runs.update((rows) => rows.map((r) => next.get(r.id) ?? r));
  }

  /** The study header shows progress and status (the first value moves planned to collecting). */
  private refreshHeader(): void {
    const s = this.store.study();
    const c = this.counts();
    if (!s || s.status === 'planned' || s.progress.recorded !== c.recorded || s.progress.invalid !== c.invalid) this.store.reload();
  }

  protected refused(message: string): void {
    this.notifier.error(message);
  }

  protected saveCell(e: CellEdit): void {
    const id = this.store.id();
    const spec = this.specs().get(e.colId);
    if (id === null || !spec) return;
    const change = cellChange(spec, e.newText, this.outcomes());
    if ('error' in change) {
      this.notifier.error(`Run ${e.run.code}, ${spec.label}: ${change.error}`);
      return;
    }
    const edit: RunEdit = { ...change.fields, runId: e.run.id, version: e.run.version };
    this.send(id, edit, e);
  }

  private send(id: number, edit: RunEdit, e: CellEdit): void {
    const { runId, ...body } = edit;
    this.api.patchRun(id, runId, body).subscribe({
      next: (res) => {
        this.replace([res.run]);
        if (res.warnings.length) this.notifier.info(res.warnings.join(' '));
        this.refreshHeader();
      },
      error: (err: unknown) => {
        if (err instanceof ApiError && err.status === 409) this.resolveConflict(id, edit, e, err.current);
        else if (err instanceof ApiError) this.notifier.error(`Run ${e.run.code}: ${err.message}`);
      },
    });
  }

  /**
   * Someone saved this run after we loaded it: show what is stored now (the 409 carries the run; the
   * sheet is fetched only when it does not) and let the user choose.
   */
  private resolveConflict(id: number, edit: RunEdit, e: CellEdit, sent: unknown): void {
    const stored = isRunFor(sent, edit.runId)
      ? of({ current: sent, outcomes: this.outcomes() })
      : this.api.runs(id, this.includeRemoved()).pipe(map((sheet) => ({ current: sheet.runs.find((r) => r.id === edit.runId), outcomes: sheet.outcomes })));
    stored.subscribe(({ current, outcomes }) => {
      const spec = this.specs().get(e.colId);
      if (!current || !spec) return;
      this.replace([current]);
      this.refreshHeader();
      const conflict = cellConflict(spec, edit, e.oldText, e.newText, current, outcomes);
      if (!conflict) return;
      this.dialog
        .open<ConflictDialog, typeof conflict, ConflictChoice>(ConflictDialog, { data: conflict, width: '480px' })
        .afterClosed()
        .subscribe((choice) => {
          if (choice === 'mine') this.send(id, conflict.retry, { ...e, run: current, oldText: cellText(spec, current, outcomes) });
        });
    });
  }

  protected pasteBlock(p: GridPaste): void {
    const id = this.store.id();
    if (id === null) return;
    const block = parseTsv(p.text);
    const plan = planPaste(block, p.target, this.byId(), this.specs(), this.outcomes());
    this.pasteErrors.set(plan.errors);
    if (plan.errors.length) return;
    this.busy.set(true);
    this.api.batch(id, { edits: plan.edits, reason: 'paste' }).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.replace(res.runs);
        this.lastPaste.set({ message: `Pasted ${plan.cellCount} cells into ${plan.edits.length} runs.`, undo: res.undo.edits });
        this.grid()?.flash(res.runs.map((r) => r.id), p.target.colIds.slice(0, Math.max(...block.map((b) => b.length))));
        this.refreshHeader();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        if (!(err instanceof ApiError)) return;
        if (err.status === 409) {
          this.pasteErrors.set([`${err.message} Nothing was pasted. The sheet now shows the stored values; paste again if the block still applies.`]);
          this.sheet.reload();
        } else this.pasteErrors.set([err.message, ...err.details.map((d) => `${d.path}: ${d.message}`)]);
      },
    });
  }

  protected undoPaste(): void {
    const id = this.store.id();
    const undo = this.lastPaste()?.undo;
    if (id === null || !undo?.length) return;
    this.busy.set(true);
    this.api.batch(id, { edits: undo, reason: 'undo paste' }).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.replace(res.runs);
        this.lastPaste.set({ message: 'The paste was undone; the previous values are back.', undo: null });
        this.refreshHeader();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        if (err instanceof ApiError) this.pasteErrors.set([`Undo failed: ${err.message}`]);
        this.sheet.reload();
      },
    });
  }

  protected rowAction(a: { kind: RowActionKind; run: Run }): void {
    const id = this.store.id();
    if (id === null) return;
    if (a.kind === 'attachments') {
      this.dialog
        .open<AttachmentsDialog, AttachmentsDialogData>(AttachmentsDialog, { data: { studyId: id, run: a.run, canEdit: this.canEdit() }, width: '720px' })
        .afterClosed()
        .subscribe(() => this.sheet.reload());
    } else if (a.kind === 'history') {
      this.dialog.open<RunHistoryDialog, RunHistoryData>(RunHistoryDialog, { data: { studyId: id, run: a.run }, width: '860px' });
    } else this.removeOrRestore(id, a.run, a.kind === 'remove');
  }

  private removeOrRestore(id: number, run: Run, remove: boolean): void {
    const data: ReasonDialogData = remove
      ? {
          title: `Remove run ${run.code}`,
          message: 'The run stays on record with your reason and leaves the analysis. It can be restored later.',
          action: 'Remove run',
          destructive: true,
          required: true,
        }
      : { title: `Restore run ${run.code}`, message: 'The run returns to the sheet and the analysis.', action: 'Restore run', required: true };
    this.dialog
      .open<ReasonDialog, ReasonDialogData, string>(ReasonDialog, { data, width: '480px' })
      .afterClosed()
      .subscribe((reason) => {
        if (!reason) return;
        const call = remove ? this.api.removeRun(id, run.id, reason, run.version) : this.api.restoreRun(id, run.id, reason);
        call.subscribe({
          next: (r) => {
            if (remove && !this.includeRemoved()) this.runs.update((rows) => rows.filter((x) => x.id !== r.id));
            else this.replace([r]);
            this.notifier.info(remove ? `Run ${r.code} removed` : `Run ${r.code} restored`);
          },
          error: (err: unknown) => {
            if (err instanceof ApiError) this.notifier.error(err.message);
          },
        });
      });
  }
}

/** The run a 409 sent back, when it is one (shape checked: it comes from the network). */
function isRunFor(x: unknown, runId: number): x is Run {
  if (typeof x !== 'object' || x === null) return false;
  const r = x as Partial<Run>;
  return r.id === runId && typeof r.version === 'number' && typeof r.code === 'string' && typeof r.values === 'object' && typeof r.settings === 'object';
}
