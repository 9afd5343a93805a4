import {
  instrumentConditions,
  type InstrumentCondition,
  type InstrumentStatus,
} from '@shared/api/instrument';
import type { InstrumentFamily } from '@shared/music/instrument-data';
import { instrumentById } from '@shared/music/instruments';
import { dayText as calendarDayText } from '@shared/calendar/day-text';
import { choicesOf } from '../core/grid/filter-select/filter-select';

/** How a status reads on screen: words and an icon, never a colour alone. */
export interface StatusLook {
  label: string;
  icon: string;
  /** A tone for the icon only; the words carry the meaning. */
  tone: 'ok' | 'info' | 'warn' | 'danger' | 'muted';
}

/** Each instrument status in words, with its icon. */
export const statusLooks: Record<InstrumentStatus, StatusLook> = {
  available: { label: 'Available', icon: 'check_circle', tone: 'ok' },
  'on-loan': { label: 'On loan', icon: 'handshake', tone: 'info' },
  'in-repair': { label: 'In repair', icon: 'build', tone: 'warn' },
  'to-clean': { label: 'To clean', icon: 'sanitizer', tone: 'warn' },
  missing: { label: 'Missing', icon: 'help', tone: 'danger' },
  retired: { label: 'Retired', icon: 'block', tone: 'muted' },
};

/** Each condition grade in words. */
export const conditionLabels: Record<InstrumentCondition, string> = {
  excellent: 'Excellent',
  good: 'Good',
  fair: 'Fair',
  poor: 'Poor',
  unserviceable: 'Unserviceable',
};

/** The condition grades as a select's choices, best first. */
export const conditionChoices = choicesOf(instrumentConditions, (value) => conditionLabels[value]);

/** Each instrument family in words. */
export const familyLabels: Record<InstrumentFamily, string> = {
  woodwind: 'Woodwind',
  brass: 'Brass',
  percussion: 'Percussion',
  strings: 'Strings',
};

/**
 * The cleaning caution shown wherever a wind instrument comes back or waits to be cleaned
 * (common practice, no source; the district's health guidance decides the method).
 */
export const cleaningCaution =
  'Mouthpieces and reeds are personal. Clean and sanitise a returned wind instrument before it is lent again, following the district’s health guidance.';

/** The handling note of a heavy instrument (common practice, no source). */
export const handlingCaution = 'Travels in a wheeled case; carry it with two people where needed.';

const dollars = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
const wholeDollars = new Intl.NumberFormat('en-US', {
  style: 'currency',
  currency: 'USD',
  maximumFractionDigits: 0,
});

/** An amount kept in cents, as dollars; empty when there is none. */
export function money(cents: number | null | undefined, whole = false): string {
  if (cents === null || cents === undefined) return '';
  return (whole ? wholeDollars : dollars).format(cents / 100);
}

/** Dollars typed by a person ("45", "45.50", "$1,200") as cents, or null when not a number. */
export function centsOf(text: string): number | null {
  const cleaned = text.replace(/[$,\s]/g, '');
  if (cleaned === '') return null;
  if (!/^\d+(\.\d{1,2})?$/.test(cleaned)) return Number.NaN;
  return Math.round(Number(cleaned) * 100);
}

/** A YYYY-MM-DD day (or an ISO time) as "Mar 4, 2025"; empty when there is none. */
export function dayText(value: string | null | undefined): string {
  if (!value) return '';
  return calendarDayText(value) ?? value;
}

/** The music engine's name of an instrument kind; the API's name when the engine knows none. */
export function instrumentKindName(instrumentId: string, fallback: string): string {
  try {
    return instrumentById(instrumentId).name;
  } catch {
    return fallback;
  }
}
