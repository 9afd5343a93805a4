import {
  ChangeDetectionStrategy,
  Component,
  afterNextRender,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { map } from 'rxjs';
import { injectTypedSearch } from '../../core/state/typed-search';
import type { Instrument, InstrumentStatus } from '@shared/api/instrument';
import { FleetInstruments } from '../instrument-data';
import { statusLooks } from '../instrument-labels';

/** Finds an instrument by asset tag (or serial, maker, model) as the user types. */
@Component({
  selector: 'tb-instrument-picker',
  imports: [MatAutocompleteModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" class="picker">
      <mat-label>{{ label() }}</mat-label>
      <mat-icon matPrefix svgIcon="search" />
      <input
        matInput
        type="search"
        [matAutocomplete]="choices"
        [value]="text()"
        #searchBox
        (input)="typed(searchBox.value)"
        placeholder="Type an asset tag"
        autocomplete="off"
        data-testid="instrument-picker"
      />
      <mat-autocomplete
        #choices="matAutocomplete"
        [displayWith]="describe"
        (optionSelected)="pick($event.option.value)"
      >
        @for (instrument of search.found(); track instrument.id) {
          <mat-option [value]="instrument">
            <strong>{{ instrument.assetTag }}</strong> · {{ instrument.instrumentName }} ·
            {{ instrument.homeSchoolCode }}
            @if (!status()) {
              · {{ statusLooks[instrument.status].label }}
            }
          </mat-option>
        }
        @if (search.searched() && search.found().length === 0) {
          <mat-option disabled
            >No {{ status() ? statusLooks[status()!].label.toLowerCase() + ' ' : '' }}instrument
            matches.</mat-option
          >
        }
      </mat-autocomplete>
      @if (hint()) {
        <mat-hint>{{ hint() }}</mat-hint>
      }
    </mat-form-field>
  `,
  styles: `
    .picker {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentPicker {
  private readonly fleet = inject(FleetInstruments);

  readonly label = input('Instrument');
  /** Only instruments in this status, such as 'available' for a check-out. */
  readonly status = input<InstrumentStatus | null>(null);
  readonly hint = input('');
  /** The instrument already chosen when the picker opens (from the instrument's own page). */
  readonly initial = input<Instrument | null>(null);
  readonly picked = output<Instrument | null>();

  protected readonly statusLooks = statusLooks;
  protected readonly text = signal('');
  protected readonly search = injectTypedSearch((text) => {
    const query: Record<string, string | number> = { q: text, limit: 12, sort: 'assetTag:asc' };
    const status = this.status();
    if (status) query['status'] = status;
    return this.fleet.list(query).pipe(map((page) => page.rows));
  });
  protected readonly describe = (instrument: Instrument | string | null) =>
    typeof instrument === 'string'
      ? instrument
      : instrument
        ? `${instrument.assetTag} · ${instrument.instrumentName}`
        : '';

  constructor() {
    afterNextRender(() => {
      const initial = this.initial();
      if (initial) this.text.set(this.describe(initial));
    });
  }

  protected typed(text: string): void {
    this.text.set(text);
    this.picked.emit(null);
    this.search.typed(text);
  }

  protected pick(instrument: Instrument): void {
    this.picked.emit(instrument);
  }
}
