import {
  ChangeDetectionStrategy,
  Component,
  afterNextRender,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { map } from 'rxjs';
import { PickerOption, SearchPicker } from '../../core/forms/search-picker';
import { injectTypedSearch } from '../../core/state/typed-search';
import type { Instrument, InstrumentStatus } from '@shared/api/instrument';
import { FleetInstruments } from '../instrument-data';
import { statusLooks } from '../instrument-labels';

/** Finds an instrument by asset tag (or serial, maker, model) as the user types. */
@Component({
  selector: 'tb-instrument-picker',
  imports: [PickerOption, SearchPicker],
  template: `
    <tb-search-picker
      [label]="label()"
      placeholder="Type an asset tag"
      [noMatch]="noMatch()"
      [hint]="hint()"
      [search]="search"
      [describe]="describe"
      testId="instrument-picker"
      [(text)]="text"
      (picked)="picked.emit($event)"
    >
      <ng-template [tbPickerOption]="search" let-instrument>
        <strong>{{ instrument.assetTag }}</strong> · {{ instrument.instrumentName }} ·
        {{ instrument.homeSchoolCode }}
        @if (!status()) {
          · {{ statusLooks[instrument.status].label }}
        }
      </ng-template>
    </tb-search-picker>
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

  /** The words of the "nothing matches" line, naming the status searched for. */
  protected noMatch(): string {
    const status = this.status();
    return `No ${status ? statusLooks[status].label.toLowerCase() + ' ' : ''}instrument matches.`;
  }
}
