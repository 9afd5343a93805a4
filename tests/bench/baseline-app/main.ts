import { ChangeDetectionStrategy, Component } from '@angular/core';
import { bootstrapApplication } from '@angular/platform-browser';
import { provideZonelessChangeDetection } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';

/** The smallest Material app: the baseline the app's initial bundle is measured against. */
@Component({
  selector: 'tb-baseline',
  imports: [MatButtonModule],
  template: '<button mat-flat-button>Baseline</button>',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class Baseline {}

bootstrapApplication(Baseline, { providers: [provideZonelessChangeDetection()] }).catch(
  (error: unknown) => console.error(error),
);
