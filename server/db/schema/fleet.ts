import { sql } from 'drizzle-orm';
import { boolean, index, integer, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import {
  instrumentConditions,
  instrumentEventKinds,
  instrumentStatuses,
} from '../../../shared/api/instrument';
import { loanStates } from '../../../shared/api/loan';
import { repairStatuses } from '../../../shared/api/repair';
import { countStates, scanOutcomes } from '../../../shared/api/count';
import { identity, timestamps, version, moment, day, linkTo } from './columns';
import { actedBy } from './people';
import { students } from './roster';
import { schools } from './schools';

/** A district-owned instrument, known everywhere by its asset tag. */
export const instruments = pgTable(
  'instruments',
  {
    ...identity,
    assetTag: text('asset_tag').notNull(),
    /** The music engine's instrument id ('tuba', 'alto-sax'…). */
    instrumentId: text('instrument_id').notNull(),
    maker: text('maker').notNull().default(''),
    model: text('model').notNull().default(''),
    serial: text('serial').notNull().default(''),
    purchasedOn: day('purchased_on'),
    purchaseCostCents: integer('purchase_cost_cents'),
    fundingSource: text('funding_source').notNull().default(''),
    condition: text('condition', { enum: instrumentConditions }).notNull().default('good'),
    status: text('status', { enum: instrumentStatuses }).notNull().default('available'),
    homeSchoolId: linkTo('home_school_id', () => schools.id),
    location: text('location').notNull().default(''),
    notes: text('notes').notNull().default(''),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('instruments_asset_tag_unique').on(table.assetTag),
    index('instruments_school_idx').on(table.homeSchoolId, table.assetTag),
    index('instruments_status_idx').on(table.status, table.assetTag),
    index('instruments_kind_idx').on(table.instrumentId, table.assetTag),
    index('instruments_condition_idx').on(table.condition, table.assetTag),
    index('instruments_purchased_idx').on(table.purchasedOn, table.id),
  ],
);

/** A photo of an instrument; the bytes live on disk under the data folder. */
export const instrumentPhotos = pgTable(
  'instrument_photos',
  {
    ...identity,
    instrumentId: linkTo('instrument_id', () => instruments.id, 'cascade'),
    /** The random file name under `<data dir>/photos/`. */
    fileName: text('file_name').notNull(),
    contentType: text('content_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    uploadedBy: actedBy('uploaded_by'),
    ...timestamps,
  },
  (table) => [index('instrument_photos_instrument_idx').on(table.instrumentId)],
);

/** One entry of an instrument's timeline. */
export const instrumentEvents = pgTable(
  'instrument_events',
  {
    ...identity,
    instrumentId: linkTo('instrument_id', () => instruments.id, 'cascade'),
    kind: text('kind', { enum: instrumentEventKinds }).notNull(),
    at: moment('at').notNull().defaultNow(),
    note: text('note').notNull().default(''),
    userId: actedBy('user_id'),
    loanId: integer('loan_id'),
    repairId: integer('repair_id'),
    countId: integer('count_id'),
  },
  (table) => [index('instrument_events_instrument_idx').on(table.instrumentId, table.at)],
);

/** A loan of an instrument to a student, with the guardian's signed agreement. */
export const loans = pgTable(
  'loans',
  {
    ...identity,
    instrumentId: linkTo('instrument_id', () => instruments.id),
    studentId: linkTo('student_id', () => students.id),
    schoolId: linkTo('school_id', () => schools.id),
    checkedOutOn: day('checked_out_on').notNull(),
    dueOn: day('due_on').notNull(),
    accessories: text('accessories').array().notNull().default([]),
    conditionOut: text('condition_out', { enum: instrumentConditions }).notNull(),
    conditionIn: text('condition_in', { enum: instrumentConditions }),
    returnedOn: day('returned_on'),
    usageFeeCents: integer('usage_fee_cents').notNull().default(0),
    waiver: boolean('waiver').notNull().default(false),
    waiverReason: text('waiver_reason'),
    state: text('state', { enum: loanStates }).notNull().default('active'),
    checkedOutBy: actedBy('checked_out_by'),
    /** SHA-256 of the one-time signing link's token; the token itself is never stored. */
    agreementTokenHash: text('agreement_token_hash'),
    agreementExpiresAt: moment('agreement_expires_at'),
    signedName: text('signed_name'),
    signedAt: moment('signed_at'),
    /** The exact text the guardian signed, and its SHA-256 (hex). */
    signedText: text('signed_text'),
    agreementTextHash: text('agreement_text_hash'),
    agreementTextVersion: integer('agreement_text_version'),
    ...version,
    ...timestamps,
  },
  (table) => [
    // At most one active loan per instrument: two checkouts racing for it cannot both commit.
    uniqueIndex('loans_one_active_per_instrument')
      .on(table.instrumentId)
      .where(sql`state = 'active'`),
    uniqueIndex('loans_agreement_token_unique').on(table.agreementTokenHash),
    index('loans_school_idx').on(table.schoolId, table.state, table.dueOn),
    index('loans_student_idx').on(table.studentId),
    index('loans_due_idx').on(table.state, table.dueOn),
  ],
);

/** A repair ticket: in-house work or a vendor's. */
export const repairTickets = pgTable(
  'repair_tickets',
  {
    ...identity,
    instrumentId: linkTo('instrument_id', () => instruments.id),
    problem: text('problem').notNull(),
    reportedBy: actedBy('reported_by'),
    /** The repair shop; null for in-house work. */
    vendor: text('vendor'),
    inHouse: boolean('in_house').notNull().default(true),
    estimateCents: integer('estimate_cents'),
    finalCostCents: integer('final_cost_cents'),
    sentOn: day('sent_on'),
    returnedOn: day('returned_on'),
    status: text('status', { enum: repairStatuses }).notNull().default('open'),
    notes: text('notes').notNull().default(''),
    loanId: integer('loan_id'),
    ...version,
    ...timestamps,
  },
  (table) => [
    index('repair_tickets_instrument_idx').on(table.instrumentId, table.status),
    index('repair_tickets_status_idx').on(table.status, table.createdAt),
  ],
);

/** An inventory count at one school. */
export const counts = pgTable(
  'counts',
  {
    ...identity,
    schoolId: linkTo('school_id', () => schools.id),
    startedBy: actedBy('started_by'),
    startedAt: moment('started_at').notNull().defaultNow(),
    closedAt: moment('closed_at'),
    state: text('state', { enum: countStates }).notNull().default('open'),
    ...timestamps,
  },
  (table) => [index('counts_school_idx').on(table.schoolId, table.startedAt)],
);

/** One asset tag scanned or typed during a count. */
export const countScans = pgTable(
  'count_scans',
  {
    ...identity,
    countId: linkTo('count_id', () => counts.id, 'cascade'),
    /** The tag as typed, before matching. */
    assetTag: text('asset_tag').notNull(),
    instrumentId: integer('instrument_id').references(() => instruments.id),
    outcome: text('outcome', { enum: scanOutcomes }).notNull(),
    scannedBy: actedBy('scanned_by'),
    scannedAt: moment('scanned_at').notNull().defaultNow(),
  },
  (table) => [index('count_scans_count_idx').on(table.countId, table.instrumentId)],
);
