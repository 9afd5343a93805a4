import type { RepairStatus } from '@shared/api/repair';
import type { StatusLook } from '../instruments/instrument-labels';

/** Each repair ticket status in words, with its icon. */
export const repairStatusLooks: Record<RepairStatus, StatusLook> = {
  open: { label: 'Open', icon: 'build', tone: 'warn' },
  sent: { label: 'Sent to vendor', icon: 'local_shipping', tone: 'info' },
  returned: { label: 'Back from repair', icon: 'keyboard_return', tone: 'info' },
  closed: { label: 'Closed', icon: 'task_alt', tone: 'ok' },
};
