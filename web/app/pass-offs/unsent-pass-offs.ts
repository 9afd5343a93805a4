/** Where the pass-off queue keeps a user's unsent entries in localStorage. */
export function passOffQueueStorageKey(userId: number): string {
  return `tuttiboard.pass-off-queue.${userId}`;
}

/**
 * How many pass-offs the user entered on this device that the server has not recorded yet. Read
 * straight from storage (the queue writes it on every change), so it needs neither the queue nor
 * its schemas loaded.
 */
export function unsentPassOffCount(userId: number): number {
  try {
    const stored: unknown = JSON.parse(
      localStorage.getItem(passOffQueueStorageKey(userId)) ?? '[]',
    );
    return Array.isArray(stored) ? stored.length : 0;
  } catch {
    return 0;
  }
}
