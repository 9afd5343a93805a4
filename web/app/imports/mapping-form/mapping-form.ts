import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  model,
  signal,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Subject, catchError, of, startWith, switchMap } from 'rxjs';
import {
  mappingProblems,
  requiredRosterFields,
  rosterColumnNames,
  rosterFieldLabels,
  rosterFields,
  type ColumnMapping,
  type RosterField,
} from '@shared/roster/roster-columns';
import { errorMessage } from '../../core/parse';
import { RosterImports } from '../roster-imports';
import { createWrite } from '../../core/state/write';

/** Which of the file's columns feeds each roster field, with saved mappings to load and save. */
@Component({
  selector: 'tb-mapping-form',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './mapping-form.html',
  styleUrl: './mapping-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MappingForm {
  private readonly write = createWrite();
  private readonly imports = inject(RosterImports);

  readonly headers = input.required<string[]>();
  readonly guessed = input<ColumnMapping>({});
  readonly mapping = model.required<ColumnMapping>();

  protected readonly fields = rosterFields;
  protected readonly labels = rosterFieldLabels;
  protected readonly columnNames = rosterColumnNames;
  protected readonly presetName = signal('');
  protected readonly presetMessage = signal('');
  private readonly reloadPresets = new Subject<void>();
  protected readonly presets = toSignal(
    this.reloadPresets.pipe(
      startWith(undefined),
      switchMap(() => this.imports.presets().pipe(catchError(() => of({ rows: [], total: 0 })))),
    ),
    { initialValue: { rows: [], total: 0 } },
  );
  protected readonly problemOf = computed(
    () =>
      new Map(
        mappingProblems(this.mapping(), this.headers()).map((problem) => [
          problem.field,
          problem.message,
        ]),
      ),
  );

  protected isRequired(field: RosterField): boolean {
    return requiredRosterFields.includes(field);
  }

  protected choose(field: RosterField, header: string) {
    const next = { ...this.mapping() };
    if (header) next[field] = header;
    else delete next[field];
    this.mapping.set(next);
  }

  protected wasGuessed(field: RosterField): boolean {
    const chosen = this.mapping()[field];
    return chosen !== undefined && chosen === this.guessed()[field];
  }

  protected loadPreset(id: number) {
    const preset = this.presets().rows.find((row) => row.id === id);
    if (!preset) return;
    const headers = new Set(this.headers());
    const usable = Object.fromEntries(
      Object.entries(preset.mapping).filter(([, header]) => header && headers.has(header)),
    );
    this.mapping.set(usable);
    this.presetName.set(preset.name);
    const missing = Object.keys(preset.mapping).length - Object.keys(usable).length;
    this.presetMessage.set(
      missing > 0
        ? `Loaded “${preset.name}”; ${missing} of its columns are not in this file.`
        : `Loaded “${preset.name}”.`,
    );
  }

  protected savePreset() {
    const name = this.presetName().trim();
    if (!name) return;
    this.write.send(this.imports.savePreset(name, this.mapping()), {
      next: () => {
        this.presetMessage.set(`Saved as “${name}”.`);
        this.reloadPresets.next();
      },
      error: (error: unknown) =>
        this.presetMessage.set(errorMessage(error, 'The preset could not be saved.')),
    });
  }
}
