-- Custom SQL migration file, put your code below! --
-- active_rung_counts and active_rung_days follow the active summary rows (student_attainment)
-- through statement-level triggers with transition tables (PostgreSQL CREATE TRIGGER ...
-- REFERENCING ... FOR EACH STATEMENT), as student_counts follows the roster (migration 0009):
-- each statement's rows are added by group (its new rows counted up, its old rows down), and a
-- pass-off's one row costs a few index probes. One function serves every event: the trigger's
-- arguments name the rows added and removed, read by EXECUTE, which sees the statement's
-- transition tables (PostgreSQL manual 43.10 "Trigger Functions"). Groups are written in key
-- order, so two transactions lock the same rows in the same order. A rung date's place in the
-- array is the rung reached that day: unnest and generate_subscripts in one select list run in
-- step (manual 9.19 "Array Functions", 38.5.8 "Set-Returning Functions"), cheaper here than a
-- lateral unnest per row.
CREATE OR REPLACE FUNCTION active_rung_counts_changed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  nothing constant text := '(SELECT * FROM student_attainment WHERE false)';
  added text := coalesce(nullif(TG_ARGV[0], ''), nothing);
  removed text := coalesce(nullif(TG_ARGV[1], ''), nothing);
  changes text;
BEGIN
  IF TG_TABLE_NAME = 'active_rung_rebuilds' THEN
    -- The full rebuild: everything worked out again from the summary rows.
    DELETE FROM active_rung_rebuilds;
    DELETE FROM active_rung_counts;
    DELETE FROM active_rung_days;
  ELSIF TG_OP = 'UPDATE' AND current_setting('tutti.year_start', true) = 'on' THEN
    -- While a new year is started (migration 0027) every summary row changes grade: instead of
    -- counting the old and the new version of each, one rebuild at the commit.
    INSERT INTO active_rung_rebuilds (pending) VALUES (true) ON CONFLICT DO NOTHING;
    RETURN NULL;
  END IF;
  changes := format(
    '(SELECT n.*, 1 AS change FROM %s n UNION ALL SELECT o.*, -1 FROM %s o) r WHERE r.active',
    added, removed);
  EXECUTE format($sql$
    INSERT INTO active_rung_counts AS c
      (school_id, grade, cohort_starts_on, cohort_grade, rung, dated, students)
    SELECT r.school_id, r.grade, r.cohort_starts_on, r.cohort_grade, r.rung,
      coalesce(cardinality(r.rung_dates), 0), sum(r.change)::int
    FROM %s
    GROUP BY 1, 2, 3, 4, 5, 6 HAVING sum(r.change) <> 0 ORDER BY 1, 2, 3, 4, 5, 6
    ON CONFLICT ON CONSTRAINT active_rung_counts_key
      DO UPDATE SET students = c.students + excluded.students$sql$, changes);
  EXECUTE format($sql$
    INSERT INTO active_rung_days AS c (reached_on, school_id, grade, rung, students)
    SELECT d.day, d.school_id, d.grade, d.rung, sum(d.change)::int
    FROM (SELECT unnest(r.rung_dates) AS day, r.school_id, r.grade,
        generate_subscripts(r.rung_dates, 1) AS rung, r.change
      FROM %s AND r.grade IS NOT NULL AND cardinality(r.rung_dates) > 0) d
    GROUP BY 1, 2, 3, 4 HAVING sum(d.change) <> 0 ORDER BY 1, 2, 3, 4
    ON CONFLICT ON CONSTRAINT active_rung_days_key
      DO UPDATE SET students = c.students + excluded.students$sql$, changes);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_inserted AFTER INSERT ON student_attainment
  REFERENCING NEW TABLE AS inserted_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_changed('inserted_attainment', '');
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_updated AFTER UPDATE ON student_attainment
  REFERENCING OLD TABLE AS previous_attainment NEW TABLE AS updated_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_changed('updated_attainment', 'previous_attainment');
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_deleted AFTER DELETE ON student_attainment
  REFERENCING OLD TABLE AS deleted_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_changed('', 'deleted_attainment');
--> statement-breakpoint
-- A truncate empties the summary rows: a rebuild at the commit finds none.
CREATE OR REPLACE FUNCTION active_rung_counts_truncated() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO active_rung_rebuilds (pending) VALUES (true) ON CONFLICT DO NOTHING;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_truncated AFTER TRUNCATE ON student_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_truncated();
--> statement-breakpoint
-- The rebuild asked for (a row in active_rung_rebuilds), at the commit: a deferred constraint
-- trigger fires at the end of the transaction (PostgreSQL CREATE CONSTRAINT TRIGGER ...
-- INITIALLY DEFERRED), after every statement of it, whatever their order.
CREATE CONSTRAINT TRIGGER active_rung_counts_rebuild AFTER INSERT ON active_rung_rebuilds
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW
  EXECUTE FUNCTION active_rung_counts_changed('student_attainment', '');
--> statement-breakpoint
-- Fired whatever the session's replication role, as the attainment triggers are (migration 0007),
-- so a bulk load that skips the per-row foreign-key checks still keeps the counts.
ALTER TABLE student_attainment ENABLE ALWAYS TRIGGER active_rung_counts_inserted;
--> statement-breakpoint
ALTER TABLE student_attainment ENABLE ALWAYS TRIGGER active_rung_counts_updated;
--> statement-breakpoint
ALTER TABLE student_attainment ENABLE ALWAYS TRIGGER active_rung_counts_deleted;
--> statement-breakpoint
ALTER TABLE student_attainment ENABLE ALWAYS TRIGGER active_rung_counts_truncated;
--> statement-breakpoint
ALTER TABLE active_rung_rebuilds ENABLE ALWAYS TRIGGER active_rung_counts_rebuild;
--> statement-breakpoint
-- The counts of the rows already there, at this migration's commit.
INSERT INTO active_rung_rebuilds (pending) VALUES (true);
