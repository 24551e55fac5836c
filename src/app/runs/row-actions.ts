import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { ICellRendererAngularComp } from 'ag-grid-angular';
import type { ICellRendererParams } from 'ag-grid-community';
import type { Run } from '../studies/study-types';
import type { GridContext, RowActionKind } from './run-grid';

/** Per-run buttons in the sheet: files, history, remove/restore. Viewers get files and history only. */
@Component({
  selector: 'sm-row-actions',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule, MatTooltipModule],
  template: `
    @if (run(); as r) {
      <button type="button" class="act" (click)="act('attachments')" [attr.aria-label]="'Files of run ' + r.code + ': ' + r.attachmentCount" matTooltip="Files" data-action="attachments">
        <mat-icon>attach_file</mat-icon><span class="count">{{ r.attachmentCount }}</span>
      </button>
      <button type="button" class="act" (click)="act('history')" [attr.aria-label]="'History of run ' + r.code" matTooltip="History" data-action="history">
        <mat-icon>history</mat-icon>
      </button>
      @if (canEdit()) {
        @if (r.removedAt === null) {
          <button type="button" class="act" (click)="act('remove')" [attr.aria-label]="'Remove run ' + r.code" matTooltip="Remove run (with a reason)" data-action="remove">
            <mat-icon>delete</mat-icon>
          </button>
        } @else {
          <button type="button" class="act" (click)="act('restore')" [attr.aria-label]="'Restore run ' + r.code" matTooltip="Restore run" data-action="restore">
            <mat-icon>restore_from_trash</mat-icon>
          </button>
        }
      }
    }
  `,
  styles: `
    :host {
      display: flex;
      gap: 2px;
      align-items: center;
      height: 100%;
      text-decoration: none;
    }
    .act {
      display: inline-flex;
      align-items: center;
      gap: 2px;
      border: 0;
      background: transparent;
      color: var(--mat-sys-on-surface-variant);
      border-radius: 6px;
      padding: 2px 4px;
      cursor: pointer;
      font: inherit;
      mat-icon {
        font-size: 18px;
        width: 18px;
        height: 18px;
      }
      &:hover,
      &:focus-visible {
        background: var(--mat-sys-surface-container-high);
        color: var(--mat-sys-on-surface);
      }
    }
    .count {
      font-variant-numeric: tabular-nums;
    }
  `,
})
export class RowActions implements ICellRendererAngularComp {
  protected readonly run = signal<Run | null>(null);
  protected readonly canEdit = signal(false);
  private context: GridContext | null = null;

  agInit(params: ICellRendererParams<Run, unknown, GridContext>): void {
    this.refresh(params);
  }

  refresh(params: ICellRendererParams<Run, unknown, GridContext>): boolean {
    this.run.set(params.data ?? null);
    this.context = params.context;
    this.canEdit.set(params.context.canEdit);
    return true;
  }

  protected act(kind: RowActionKind): void {
    const run = this.run();
    if (run) this.context?.rowAction(kind, run);
  }
}
