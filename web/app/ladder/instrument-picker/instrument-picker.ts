import { ChangeDetectionStrategy, Component, input, model } from '@angular/core';
import { Field } from '../../core/forms/field';
import { instrumentChoiceGroups } from '../../core/forms/instrument-choices';
import { familyLabels } from '../../practice/labels';

/** Picks the instrument practice-sheet links are written for, grouped by family. */
@Component({
  selector: 'tb-instrument-picker',
  imports: [Field],
  template: `
    <tb-field
      class="picker"
      dense
      [label]="label()"
      [groups]="groups"
      [value]="instrumentId()"
      (valueChange)="$event && instrumentId.set($event)"
      testId="instrument-picker"
    />
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
  protected readonly groups = instrumentChoiceGroups(familyLabels);
}
