import { ChangeDetectionStrategy, Component, input, model } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { instrumentFamilies, instruments, type InstrumentSpec } from '@shared/music';
import { familyLabels } from '../../practice/labels';

const groups: { label: string; instruments: InstrumentSpec[] }[] = instrumentFamilies.map(
  (family) => ({
    label: familyLabels[family],
    instruments: instruments.filter((instrument) => instrument.family === family),
  }),
);

/** Picks the instrument practice-sheet links are written for, grouped by family. */
@Component({
  selector: 'tb-instrument-picker',
  imports: [MatFormFieldModule, MatSelectModule],
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic" class="picker">
      <mat-label>{{ label() }}</mat-label>
      <mat-select
        [value]="instrumentId()"
        (valueChange)="instrumentId.set($event)"
        data-testid="instrument-picker"
      >
        @for (group of groups; track group.label) {
          <mat-optgroup [label]="group.label">
            @for (instrument of group.instruments; track instrument.id) {
              <mat-option [value]="instrument.id">{{ instrument.name }}</mat-option>
            }
          </mat-optgroup>
        }
      </mat-select>
    </mat-form-field>
  `,
  styles: `
    .picker {
      min-width: 220px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentPicker {
  /** The chosen instrument's id. */
  readonly instrumentId = model.required<string>();
  readonly label = input('Practice sheets for');
  protected readonly groups = groups;
}
