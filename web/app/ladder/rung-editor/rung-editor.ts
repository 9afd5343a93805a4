import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { LadderRequirement, LadderRung } from '@shared/api/ladder';
import { requirementTempoRange } from '@shared/api/ladder';
import { articulations, instrumentFamilies, modes, patternIds, type Mode } from '@shared/music';
import { articulationLabels, familyLabels, modeLabels, patternLabels } from '../../practice/labels';
import type { FieldErrors } from '../ladder-editor/draft-model';
import { tonicsForMode } from '../ladder-editor/draft-model';
import { tonicText } from '../requirement-text';
import { IconButton } from '../../core/icon-button/icon-button';

/** One change to one requirement of the rung. */
export interface RequirementEdit {
  index: number;
  patch: Partial<LadderRequirement>;
}

/** Edits one rung of a draft: its title and its requirements. */
@Component({
  selector: 'tb-rung-editor',
  imports: [
    IconButton,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    MatTooltipModule,
  ],
  templateUrl: './rung-editor.html',
  styleUrl: './rung-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RungEditor {
  readonly rung = input.required<LadderRung>();
  /** The rung's place in the draft (0 for the first). */
  readonly index = input.required<number>();
  readonly rungCount = input.required<number>();
  readonly errors = input.required<FieldErrors>();

  readonly titleChange = output<string>();
  readonly requirementEdit = output<RequirementEdit>();
  readonly requirementAdd = output<void>();
  readonly requirementRemove = output<number>();
  readonly move = output<-1 | 1>();
  readonly remove = output<void>();

  protected readonly modes = modes;
  protected readonly patternIds = patternIds;
  protected readonly articulations = articulations;
  protected readonly families = instrumentFamilies;
  protected readonly modeLabels = modeLabels;
  protected readonly patternLabels = patternLabels;
  protected readonly articulationLabels = articulationLabels;
  protected readonly familyLabels = familyLabels;
  protected readonly tonicText = tonicText;
  protected readonly tempoRange = requirementTempoRange;

  protected tonicsFor(mode: Mode): readonly string[] {
    return tonicsForMode(mode);
  }

  /** The API's message for a field of this rung ('title') or of one requirement ('2.tempo'). */
  protected error(field: string): string {
    return this.errors().get(`rungs.${this.index()}.${field}`) ?? '';
  }

  protected requirementError(position: number, field: string): string {
    return this.error(`requirements.${position}.${field}`);
  }

  protected edit(index: number, patch: Partial<LadderRequirement>): void {
    this.requirementEdit.emit({ index, patch });
  }

  protected tempoFrom(event: Event): number {
    const text = (event.target as HTMLInputElement).value.trim();
    return text === '' ? Number.NaN : Number(text);
  }

  protected textFrom(event: Event): string {
    return (event.target as HTMLInputElement).value;
  }
}
