import { describe, expect, it } from 'vitest';
import { syncDue } from './sync-scheduler';

// America/Chicago is UTC−5 in September (IANA tz database, daylight time).
const zone = 'America/Chicago';

describe('syncDue', () => {
  it('should be due when the run time has come in the district zone and no run started since', () => {
    const sync = { enabled: true, runAt: '02:00', lastRunAt: new Date('2026-09-13T07:01:00Z') };
    expect(syncDue(sync, new Date('2026-09-14T06:59:00Z'), zone)).toBe(false);
    expect(syncDue(sync, new Date('2026-09-14T07:00:00Z'), zone)).toBe(true);
  });

  it('should not be due again the same night when a run started after the run time', () => {
    const sync = { enabled: true, runAt: '02:00', lastRunAt: new Date('2026-09-14T07:00:30Z') };
    expect(syncDue(sync, new Date('2026-09-14T09:00:00Z'), zone)).toBe(false);
  });

  it('should not be due when the sync is switched off', () => {
    const sync = { enabled: false, runAt: '02:00', lastRunAt: null };
    expect(syncDue(sync, new Date('2026-09-14T09:00:00Z'), zone)).toBe(false);
  });
});
