import { ChangeDetectionStrategy, Component } from '@angular/core';
import { FormArray, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { Observable } from 'rxjs';
import { factorsBody, type FactorsBody } from '../../../shared/studies';
import { factorGroup, factorsValue, levelGroup, type FactorGroup } from './setup-forms';
import { SetupListEditor } from './setup-list-editor';
import type { StudyDetail } from './study-types';

/** Factors and their levels. Once runs exist the design is fixed: symbols, kinds and level values lock. */
@Component({
  selector: 'sm-factors-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, MatTooltipModule],
  templateUrl: './factors-editor.html',
  styleUrl: './setup-editors.scss',
})
export class FactorsEditor extends SetupListEditor<FactorGroup, FactorsBody> {
  constructor() {
    super('factors', factorsBody, 'Factors');
  }

  protected groupsOf(s: StudyDetail): FactorGroup[] {
    return s.factors.map((f) => factorGroup(f));
  }

  protected blank(): FactorGroup {
    return factorGroup();
  }

  protected bodyOf(list: FormArray<FactorGroup>): FactorsBody {
    return factorsValue(list);
  }

  protected put(id: number, body: FactorsBody): Observable<unknown> {
    return this.api.putFactors(id, body.factors);
  }

  /** Viewers get a read-only form; once runs exist, only names, units, labels and tracking stay editable. */
  protected override applyAccess(): void {
    super.applyAccess();
    if (!this.store.canEdit() || !this.store.hasRuns()) return;
    for (const g of this.list.controls) {
      g.controls.symbol.disable();
      g.controls.kind.disable();
      for (const l of g.controls.levels.controls) l.controls.value.disable();
    }
  }

  protected addLevel(f: FactorGroup): void {
    f.controls.levels.push(levelGroup());
    this.root.markAsDirty();
  }

  protected removeLevel(f: FactorGroup, i: number): void {
    f.controls.levels.removeAt(i);
    this.root.markAsDirty();
  }
}
