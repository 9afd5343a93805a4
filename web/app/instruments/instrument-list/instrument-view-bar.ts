import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { errorMessage } from '../../core/parse';
import {
  InstrumentViews,
  type InstrumentView,
  type InstrumentViewFilters,
} from '../instrument-views';
import { createWrite } from '../../core/state/write';

/** Saved views of the fleet: pick one to apply its filters, or save the current filters by name. */
@Component({
  selector: 'tb-instrument-view-bar',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic" class="views">
      <mat-label>Saved view</mat-label>
      <mat-select
        [value]="chosen()"
        (selectionChange)="choose($event.value)"
        data-testid="saved-views"
      >
        <mat-option [value]="null">None</mat-option>
        @for (view of views(); track view.name) {
          <mat-option [value]="view.name">{{ view.name }}</mat-option>
        }
      </mat-select>
    </mat-form-field>
    @if (chosen(); as name) {
      <button
        mat-icon-button
        type="button"
        (click)="remove(name)"
        [attr.aria-label]="'Delete the view ' + name"
      >
        <mat-icon svgIcon="delete" />
      </button>
    }
    @if (naming()) {
      <form class="naming" (submit)="$event.preventDefault(); save()">
        <mat-form-field appearance="outline" subscriptSizing="dynamic">
          <mat-label>View name</mat-label>
          <input
            matInput
            maxlength="40"
            [value]="name()"
            #nameBox
            (input)="name.set(nameBox.value)"
            data-testid="view-name"
          />
        </mat-form-field>
        <button mat-flat-button type="submit" [disabled]="!name().trim() || busy()">Save</button>
        <button mat-button type="button" (click)="naming.set(false)">Cancel</button>
      </form>
    } @else {
      <button
        mat-button
        type="button"
        [disabled]="!filtered()"
        (click)="naming.set(true)"
        data-testid="save-view"
      >
        <mat-icon svgIcon="bookmark_add" />Save these filters
      </button>
    }
    @if (failure()) {
      <span class="failed" role="alert">{{ failure() }}</span>
    }
  `,
  styles: `
    :host {
      display: contents;
    }
    .views {
      width: 180px;
    }
    .naming {
      display: flex;
      align-items: center;
      gap: 8px;
    }
    .failed {
      color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentViewBar {
  private readonly write = createWrite();
  private readonly store = inject(InstrumentViews);

  /** The filters on screen now, which "save" keeps. */
  readonly filters = input.required<InstrumentViewFilters>();
  /** Whether any filter is set (an empty view is not worth saving). */
  readonly filtered = input(false);
  /** A saved view was picked: apply its filters. */
  readonly applied = output<InstrumentViewFilters>();

  // The saved views are several reads chained (the index, then each view): an rxResource.
  private readonly saved = rxResource({ stream: () => this.store.list(), defaultValue: [] });
  protected readonly views = computed<InstrumentView[]>(() =>
    this.saved.hasValue() ? this.saved.value() : [],
  );
  protected readonly chosen = signal<string | null>(null);
  protected readonly naming = signal(false);
  protected readonly name = signal('');
  protected readonly busy = signal(false);
  protected readonly failure = signal('');

  protected choose(name: string | null): void {
    this.chosen.set(name);
    const view = this.views().find((candidate) => candidate.name === name);
    this.applied.emit(view?.filters ?? {});
  }

  protected save(): void {
    const name = this.name().trim();
    if (!name) return;
    this.busy.set(true);
    this.failure.set('');
    this.write.send(this.store.save({ name, filters: this.filters() }), {
      next: (views) => {
        this.busy.set(false);
        this.saved.set(views);
        this.chosen.set(name);
        this.naming.set(false);
        this.name.set('');
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.failure.set(errorMessage(error, 'The view could not be saved.'));
      },
    });
  }

  protected remove(name: string): void {
    this.write.send(this.store.remove(name), {
      next: (views) => {
        this.saved.set(views);
        this.chosen.set(null);
      },
      error: (error: unknown) =>
        this.failure.set(errorMessage(error, 'The view could not be deleted.')),
    });
  }
}
