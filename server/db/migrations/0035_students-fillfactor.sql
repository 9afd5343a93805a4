-- Room on each page of the roster and its summary rows for a second version of every row, so a
-- new school year's one update of every active student (no indexed column changed while the
-- start has dropped the few indexes that read the columns it changes) writes each new version on
-- the same page as the old, a heap-only tuple that no index needs an entry for (PostgreSQL
-- manual: CREATE TABLE, storage parameter fillfactor; "Heap-Only Tuples (HOT)"). The start
-- updates every active student, so 50 leaves room for all of a page's rows. The setting applies
-- to pages written after it, so both tables are rewritten (CLUSTER, which may run in a
-- transaction when it names its table, keeps the rows in key order as they were loaded).
ALTER TABLE "students" SET (fillfactor = 50);--> statement-breakpoint
ALTER TABLE "student_attainment" SET (fillfactor = 50);--> statement-breakpoint
CLUSTER "students" USING "students_pkey";--> statement-breakpoint
CLUSTER "student_attainment" USING "student_attainment_pkey";--> statement-breakpoint
ANALYZE "students";--> statement-breakpoint
ANALYZE "student_attainment";
