import type { ComponentType } from '@angular/cdk/portal';
import type { MatDialog, MatDialogConfig } from '@angular/material/dialog';
import { firstValueFrom } from 'rxjs';

/**
 * Opens `component` as a dialog and waits for it to close: the result it closed with, or
 * undefined when the user dismissed it (Escape, the backdrop, a button without a result).
 * `MatDialogRef.afterClosed()` emits once, then completes (material.angular.dev, "Dialog" API).
 */
export function dialogAnswer<Result, Data = unknown>(
  dialog: MatDialog,
  component: ComponentType<unknown>,
  config?: MatDialogConfig<Data>,
): Promise<Result | undefined> {
  return firstValueFrom(dialog.open<unknown, Data, Result>(component, config).afterClosed());
}
