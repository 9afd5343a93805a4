import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  output,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import {
  articulations,
  instrumentFamilies,
  instruments,
  modes,
  patternIds,
  schoolLevelNames,
  type Mode,
} from '@shared/music';
import {
  articulationLabels,
  familyLabels,
  modeLabels,
  patternLabels,
  withAccidentalSigns,
} from '../labels';
import {
  parseSheetRequest,
  tempoLimits,
  sheetLevels,
  toSheetQuery,
  tonicsFor,
  usualTempoSteps,
  type SheetRequest,
} from '../sheet-request';

/** One of the form's plain selects: its control, its label and its options. */
interface SelectField {
  name: 'tonic' | 'mode' | 'pattern' | 'octaves' | 'articulation';
  label: string;
  options: { value: string | number; label: string }[];
}

/** Each id with its label, as options. */
function labelled<Id extends string>(ids: readonly Id[], labels: Record<Id, string>) {
  return ids.map((id) => ({ value: id, label: labels[id] }));
}

/** The form that picks a sheet: concert key, pattern, tempo, articulation and instrument. */
@Component({
  selector: 'tb-sheet-form',
  imports: [
    ReactiveFormsModule,
    MatFormFieldModule,
    MatSelectModule,
    MatInputModule,
    MatButtonModule,
    MatSlideToggleModule,
  ],
  templateUrl: './sheet-form.html',
  styleUrl: './sheet-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SheetForm {
  private readonly formBuilder = inject(NonNullableFormBuilder);

  /** The request shown; the form follows it when it changes from outside (a link, a plan step). */
  readonly request = input.required<SheetRequest>();
  /** A new request, each time the player changes a field to a valid value. */
  readonly requestChange = output<SheetRequest>();

  protected readonly form = this.formBuilder.group({
    tonic: [''],
    mode: ['major' as Mode],
    pattern: [''],
    tempo: [
      100,
      [
        Validators.required,
        Validators.min(tempoLimits.slowest),
        Validators.max(tempoLimits.fastest),
      ],
    ],
    articulation: [''],
    octaves: [1],
    instrument: [''],
    concertPitch: [false],
    level: ['' as string],
  });
  protected readonly levels = sheetLevels.map((level) => ({
    id: level,
    label: schoolLevelNames[level].charAt(0).toUpperCase() + schoolLevelNames[level].slice(1),
  }));

  protected readonly families = instrumentFamilies.map((family) => ({
    family,
    label: familyLabels[family],
    instruments: instruments.filter((instrument) => instrument.family === family),
  }));
  protected readonly tempoSteps = usualTempoSteps;
  protected readonly tempoLimits = tempoLimits;

  /** The plain choices, in the order they stand: each control with its label and options. */
  protected readonly selects = computed((): SelectField[] => [
    {
      name: 'tonic',
      label: 'Concert key',
      options: tonicsFor(this.request().mode).map((tonic) => ({
        value: tonic,
        label: withAccidentalSigns(tonic),
      })),
    },
    { name: 'mode', label: 'Scale', options: labelled(modes, modeLabels) },
    { name: 'pattern', label: 'Pattern', options: labelled(patternIds, patternLabels) },
    {
      name: 'octaves',
      label: 'Octaves',
      options: [
        { value: 1, label: 'One octave' },
        { value: 2, label: 'Two octaves' },
      ],
    },
    {
      name: 'articulation',
      label: 'Articulation',
      options: labelled(articulations, articulationLabels),
    },
  ]);

  constructor() {
    effect(() => {
      const request = this.request();
      this.form.setValue(
        {
          tonic: request.tonic,
          mode: request.mode,
          pattern: request.pattern,
          tempo: request.tempo,
          articulation: request.articulation,
          octaves: request.octaves,
          instrument: request.instrument,
          concertPitch: request.pitch === 'concert',
          level: request.level ?? '',
        },
        { emitEvent: false },
      );
    });
    // The form's changes are a stream: each one updates the address.
    const changes = this.form.valueChanges.subscribe(() => {
      if (this.form.controls.tempo.invalid) return;
      const value = this.form.getRawValue();
      const request = parseSheetRequest({
        ...toSheetQuery(this.request()),
        ...value,
        tempo: String(value.tempo),
        octaves: String(value.octaves),
        pitch: value.concertPitch ? 'concert' : 'written',
      });
      this.requestChange.emit(request);
    });
    inject(DestroyRef).onDestroy(() => changes.unsubscribe());
  }

  /** Sets the tempo to one of the usual metronome marks. */
  protected setTempo(tempo: number): void {
    this.form.controls.tempo.setValue(tempo);
  }
}
