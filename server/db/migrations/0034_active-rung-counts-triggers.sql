-- Custom SQL migration file, put your code below! --
-- active_rung_counts and active_rung_days follow the active summary rows (student_attainment)
-- through statement-level triggers with transition tables (PostgreSQL CREATE TRIGGER ...
-- REFERENCING ... FOR EACH STATEMENT), as student_counts follows the roster (migration 0009):
-- each statement's rows are added by group, and a pass-off's one row costs a few index probes.
-- Groups are written in key order, so two transactions lock the same rows in the same order.
-- A rung date's place in the array is the rung reached that day: unnest and generate_subscripts
-- in one select list run in step (PostgreSQL manual 9.19 "Array Functions" and 38.5.8
-- "Set-Returning Functions"), cheaper here than a lateral unnest per row.
CREATE OR REPLACE FUNCTION refresh_active_rung_counts() RETURNS void LANGUAGE sql AS $$
  DELETE FROM active_rung_counts;
  DELETE FROM active_rung_days;
  INSERT INTO active_rung_counts (school_id, grade, cohort_starts_on, cohort_grade, rung, dated, students)
  SELECT a.school_id, a.grade, a.cohort_starts_on, a.cohort_grade, a.rung,
    coalesce(cardinality(a.rung_dates), 0), count(*)::int
  FROM student_attainment a WHERE a.active
  GROUP BY 1, 2, 3, 4, 5, 6 ORDER BY 1, 2, 3, 4, 5, 6;
  INSERT INTO active_rung_days (reached_on, school_id, grade, rung, students)
  SELECT d.day, d.school_id, d.grade, d.rung, count(*)::int
  FROM (SELECT unnest(a.rung_dates) AS day, a.school_id, a.grade,
      generate_subscripts(a.rung_dates, 1) AS rung
    FROM student_attainment a
    WHERE a.active AND a.grade IS NOT NULL AND cardinality(a.rung_dates) > 0) d
  GROUP BY 1, 2, 3, 4 ORDER BY 1, 2, 3, 4;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION active_rung_counts_on_inserted() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO active_rung_counts AS c
    (school_id, grade, cohort_starts_on, cohort_grade, rung, dated, students)
  SELECT n.school_id, n.grade, n.cohort_starts_on, n.cohort_grade, n.rung,
    coalesce(cardinality(n.rung_dates), 0), count(*)::int
  FROM inserted_attainment n WHERE n.active
  GROUP BY 1, 2, 3, 4, 5, 6 ORDER BY 1, 2, 3, 4, 5, 6
  ON CONFLICT ON CONSTRAINT active_rung_counts_key
    DO UPDATE SET students = c.students + excluded.students;
  INSERT INTO active_rung_days AS c (reached_on, school_id, grade, rung, students)
  SELECT d.day, d.school_id, d.grade, d.rung, count(*)::int
  FROM (SELECT unnest(n.rung_dates) AS day, n.school_id, n.grade,
      generate_subscripts(n.rung_dates, 1) AS rung
    FROM inserted_attainment n
    WHERE n.active AND n.grade IS NOT NULL AND cardinality(n.rung_dates) > 0) d
  GROUP BY 1, 2, 3, 4 ORDER BY 1, 2, 3, 4
  ON CONFLICT ON CONSTRAINT active_rung_days_key
    DO UPDATE SET students = c.students + excluded.students;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_inserted AFTER INSERT ON student_attainment
  REFERENCING NEW TABLE AS inserted_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_on_inserted();
--> statement-breakpoint
-- While a new year is started (tutti.year_start = 'on', migration 0027) every summary row
-- changes grade: instead of adding the old and the new version of each, the statement asks for
-- one rebuild at the commit (active_rung_rebuilds, below), a single pass over the final rows.
CREATE OR REPLACE FUNCTION active_rung_counts_on_updated() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF current_setting('tutti.year_start', true) = 'on' THEN
    INSERT INTO active_rung_rebuilds (pending) VALUES (true) ON CONFLICT DO NOTHING;
    RETURN NULL;
  END IF;
  INSERT INTO active_rung_counts AS c
    (school_id, grade, cohort_starts_on, cohort_grade, rung, dated, students)
  SELECT d.school_id, d.grade, d.cohort_starts_on, d.cohort_grade, d.rung, d.dated,
    sum(d.change)::int
  FROM (
    SELECT n.school_id, n.grade, n.cohort_starts_on, n.cohort_grade, n.rung,
      coalesce(cardinality(n.rung_dates), 0) AS dated, 1 AS change
    FROM updated_attainment n WHERE n.active
    UNION ALL
    SELECT o.school_id, o.grade, o.cohort_starts_on, o.cohort_grade, o.rung,
      coalesce(cardinality(o.rung_dates), 0), -1
    FROM previous_attainment o WHERE o.active
  ) d
  GROUP BY 1, 2, 3, 4, 5, 6 HAVING sum(d.change) <> 0 ORDER BY 1, 2, 3, 4, 5, 6
  ON CONFLICT ON CONSTRAINT active_rung_counts_key
    DO UPDATE SET students = c.students + excluded.students;
  INSERT INTO active_rung_days AS c (reached_on, school_id, grade, rung, students)
  SELECT d.day, d.school_id, d.grade, d.rung, sum(d.change)::int
  FROM (
    SELECT unnest(n.rung_dates) AS day, n.school_id, n.grade,
      generate_subscripts(n.rung_dates, 1) AS rung, 1 AS change
    FROM updated_attainment n
    WHERE n.active AND n.grade IS NOT NULL AND cardinality(n.rung_dates) > 0
    UNION ALL
    SELECT unnest(o.rung_dates), o.school_id, o.grade, generate_subscripts(o.rung_dates, 1), -1
    FROM previous_attainment o
    WHERE o.active AND o.grade IS NOT NULL AND cardinality(o.rung_dates) > 0
  ) d
  GROUP BY 1, 2, 3, 4 HAVING sum(d.change) <> 0 ORDER BY 1, 2, 3, 4
  ON CONFLICT ON CONSTRAINT active_rung_days_key
    DO UPDATE SET students = c.students + excluded.students;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_updated AFTER UPDATE ON student_attainment
  REFERENCING OLD TABLE AS previous_attainment NEW TABLE AS updated_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_on_updated();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION active_rung_counts_on_deleted() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE active_rung_counts c SET students = c.students - d.students
  FROM (
    SELECT o.school_id, o.grade, o.cohort_starts_on, o.cohort_grade, o.rung,
      coalesce(cardinality(o.rung_dates), 0) AS dated, count(*)::int AS students
    FROM deleted_attainment o WHERE o.active
    GROUP BY 1, 2, 3, 4, 5, 6
  ) d
  WHERE c.school_id IS NOT DISTINCT FROM d.school_id AND c.grade IS NOT DISTINCT FROM d.grade
    AND c.cohort_starts_on IS NOT DISTINCT FROM d.cohort_starts_on
    AND c.cohort_grade IS NOT DISTINCT FROM d.cohort_grade AND c.rung = d.rung AND c.dated = d.dated;
  UPDATE active_rung_days c SET students = c.students - d.students
  FROM (
    SELECT e.day, e.school_id, e.grade, e.rung, count(*)::int AS students
    FROM (SELECT unnest(o.rung_dates) AS day, o.school_id, o.grade,
        generate_subscripts(o.rung_dates, 1) AS rung
      FROM deleted_attainment o
      WHERE o.active AND o.grade IS NOT NULL AND cardinality(o.rung_dates) > 0) e
    GROUP BY 1, 2, 3, 4
  ) d
  WHERE c.reached_on = d.day AND c.school_id IS NOT DISTINCT FROM d.school_id
    AND c.grade = d.grade AND c.rung = d.rung;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_deleted AFTER DELETE ON student_attainment
  REFERENCING OLD TABLE AS deleted_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_on_deleted();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION active_rung_counts_on_truncated() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM active_rung_counts;
  DELETE FROM active_rung_days;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER active_rung_counts_truncated AFTER TRUNCATE ON student_attainment
  FOR EACH STATEMENT EXECUTE FUNCTION active_rung_counts_on_truncated();
--> statement-breakpoint
-- The rebuild a year start asked for, at its commit (a deferred constraint trigger fires at the
-- end of the transaction: PostgreSQL CREATE CONSTRAINT TRIGGER ... INITIALLY DEFERRED), after
-- every statement of the start, whatever their order.
CREATE OR REPLACE FUNCTION active_rung_counts_rebuild() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM active_rung_rebuilds;
  PERFORM refresh_active_rung_counts();
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER active_rung_counts_rebuild AFTER INSERT ON active_rung_rebuilds
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION active_rung_counts_rebuild();
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
SELECT refresh_active_rung_counts();
