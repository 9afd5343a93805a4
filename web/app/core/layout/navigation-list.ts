import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { RouterLink, RouterLinkActive } from '@angular/router';
import { MatIcon } from '@angular/material/icon';
import type { NavigationItem } from './navigation';

/** One group of the navigation with the entries the user sees in it. */
export interface NavigationGroup {
  id: NavigationItem['group'];
  label: string;
  items: NavigationItem[];
}

/** The brand and the grouped links of the main navigation, as the rail and the drawer show them. */
@Component({
  selector: 'tb-navigation-list',
  imports: [RouterLink, RouterLinkActive, MatIcon],
  templateUrl: './navigation-list.html',
  styleUrl: './navigation-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[class]': 'place()' },
})
export class NavigationList {
  readonly groups = input.required<NavigationGroup[]>();
  /**
   * Where the list is shown: the rail beside the page (icons over short labels on a tablet's
   * width) or the drawer of a narrow window (48 px touch targets).
   */
  readonly place = input<'rail' | 'drawer'>('rail');
  /** Emits when the user follows one of the links. */
  readonly chosen = output<void>();
}
