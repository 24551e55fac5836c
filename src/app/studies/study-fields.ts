import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { fieldError, type StudyForm } from './study-form';

/** The study description fields (shared by "New study" and the Overview tab). */
@Component({
  selector: 'sm-study-fields',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  template: `
    <div class="grid" [formGroup]="form()">
      <mat-form-field appearance="outline" subscriptSizing="dynamic" class="span2">
        <mat-label>Title</mat-label>
        <input matInput formControlName="title" name="title" required />
        <mat-error>{{ err('title', 'a title') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic" class="span2">
        <mat-label>Purpose</mat-label>
        <textarea matInput formControlName="purpose" name="purpose" rows="2"></textarea>
        <mat-hint>What question the study answers</mat-hint>
        <mat-error>{{ err('purpose', 'the purpose') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Specimen family</mat-label>
        <input matInput formControlName="specimenFamily" name="specimenFamily" placeholder="e.g. notched strip" />
        <mat-error>{{ err('specimenFamily', 'the specimen family') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Material grade / designation</mat-label>
        <input matInput formControlName="materialGrade" name="materialGrade" />
        <mat-error>{{ err('materialGrade', 'the material grade') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Batch / heat / coil</mat-label>
        <input matInput formControlName="batch" name="batch" />
        <mat-error>{{ err('batch', 'the batch') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Sheet thickness</mat-label>
        <input matInput formControlName="thicknessMm" name="thicknessMm" inputmode="decimal" />
        <span matTextSuffix>mm</span>
        <mat-error>{{ err('thicknessMm', 'the thickness') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Orientation</mat-label>
        <input matInput formControlName="orientationDeg" name="orientationDeg" inputmode="decimal" />
        <span matTextSuffix>°</span>
        <mat-hint>Angle to the rolling direction: 0 along, 90 across</mat-hint>
        <mat-error>{{ err('orientationDeg', 'the orientation') }}</mat-error>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic" class="span2">
        <mat-label>Material description</mat-label>
        <textarea matInput formControlName="materialDescription" name="materialDescription" rows="2"></textarea>
        <mat-hint>Supplier, condition, certificate, anything the fields above do not hold</mat-hint>
        <mat-error>{{ err('materialDescription', 'the description') }}</mat-error>
      </mat-form-field>
    </div>
  `,
  styles: `
    .grid {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(240px, 1fr));
      gap: 12px 16px;
    }
    .span2 {
      grid-column: 1 / -1;
    }
  `,
})
export class StudyFields {
  readonly form = input.required<StudyForm>();

  protected err(name: keyof StudyForm['controls'], what: string): string {
    return fieldError(this.form().controls[name], what);
  }
}
