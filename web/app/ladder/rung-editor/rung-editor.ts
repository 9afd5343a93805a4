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
import { articulations, instrumentFamilies, modes, patternIds } from '@shared/music';
import { articulationLabels, familyLabels, modeLabels, patternLabels } from '../../practice/labels';
import type { FieldErrors } from '../ladder-editor/draft-model';
import { tonicsForMode, warningText } from '../ladder-editor/draft-model';
import { tonicText } from '../requirement-text';
import { IconButton } from '../../core/icon-button/icon-button';
import { Field } from '../../core/forms/field';
import { choicesOf, type FilterChoice } from '../../core/grid/filter-select/filter-select';

/** One of a requirement's selects: the field it sets, its label, and its choices. */
interface RequirementSelect {
  key: 'mode' | 'tonic' | 'pattern' | 'articulation' | 'octaves';
  label: string;
  placeholder: string | null;
  choices: (requirement: LadderRequirement) => readonly FilterChoice<string | number>[];
}

const modeChoices = choicesOf(modes, (mode) => modeLabels[mode]);
/** The concert keys offered for each scale, major or minor. */
const tonicChoices = new Map(
  modes.map((mode) => [mode, choicesOf(tonicsForMode(mode), tonicText)]),
);
const patternChoices = choicesOf(patternIds, (id) => patternLabels[id]);
const articulationChoices = choicesOf(articulations, (id) => articulationLabels[id]);
const octaveChoices = [
  { value: 1, label: '1' },
  { value: 2, label: '2' },
];

const requirementSelects: readonly RequirementSelect[] = [
  { key: 'mode', label: 'Scale', placeholder: null, choices: () => modeChoices },
  {
    key: 'tonic',
    label: 'Concert key',
    placeholder: 'Choose',
    choices: (requirement) => tonicChoices.get(requirement.mode) ?? [],
  },
  { key: 'pattern', label: 'Pattern', placeholder: null, choices: () => patternChoices },
  {
    key: 'articulation',
    label: 'Articulation',
    placeholder: null,
    choices: () => articulationChoices,
  },
  { key: 'octaves', label: 'Octaves', placeholder: null, choices: () => octaveChoices },
];

/** One change to one requirement of the rung. */
export interface RequirementEdit {
  index: number;
  patch: Partial<LadderRequirement>;
}

/** Edits one rung of a draft: its title and its requirements. */
@Component({
  selector: 'tb-rung-editor',
  imports: [
    Field,
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

  /** The requirement's selects, in the order a director fills them in (the tempo follows). */
  protected readonly selects = requirementSelects;
  protected readonly families = instrumentFamilies;
  protected readonly familyLabels = familyLabels;
  protected readonly tempoRange = requirementTempoRange;
  protected readonly warningText = warningText;

  /** The API's message for a field of this rung ('title') or of one requirement ('2.tempo'). */
  protected error(field: string): string {
    return this.errors().get(`rungs.${this.index()}.${field}`) ?? '';
  }

  protected requirementError(position: number, field: string): string {
    return this.error(`requirements.${position}.${field}`);
  }

  /** A choice made in one of the requirement's selects. */
  protected choose(
    index: number,
    key: RequirementSelect['key'],
    value: string | number | null,
  ): void {
    if (value !== null) this.edit(index, { [key]: value } as Partial<LadderRequirement>);
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
