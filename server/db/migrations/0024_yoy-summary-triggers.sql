-- student_years.continued: whether the student played in the school year after the row's year
-- (by starts_on). When that next year is the current one, "played" is an active student now;
-- otherwise it is a row of that year that did not end withdrawn. Recomputed for one student when
-- their status changes, and for everyone when the years or the history rows change, writing only
-- the rows whose answer moved.
-- One student (a keyed read of their few rows), and every row.
CREATE OR REPLACE FUNCTION refresh_student_continued(p_student integer) RETURNS void
LANGUAGE sql AS $$
  UPDATE student_years sy SET continued = c.continued
  FROM (
    SELECT h.student_id, h.school_year_id,
      coalesce(CASE WHEN y.next_current THEN s.status = 'active'
        ELSE later.outcome <> 'withdrawn' END, false) AS continued
    FROM student_years h
    JOIN (SELECT id, lead(id) OVER w AS next_id, lead(current) OVER w AS next_current
      FROM school_years WINDOW w AS (ORDER BY starts_on)) y ON y.id = h.school_year_id
    JOIN students s ON s.id = h.student_id
    LEFT JOIN student_years later
      ON later.student_id = h.student_id AND later.school_year_id = y.next_id
    WHERE h.student_id = p_student
  ) c
  WHERE sy.student_id = c.student_id AND sy.school_year_id = c.school_year_id
    AND sy.continued IS DISTINCT FROM c.continued;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION refresh_student_years_continued() RETURNS void
LANGUAGE sql AS $$
  UPDATE student_years sy SET continued = c.continued
  FROM (
    SELECT h.student_id, h.school_year_id,
      coalesce(CASE WHEN y.next_current THEN s.status = 'active'
        ELSE later.outcome <> 'withdrawn' END, false) AS continued
    FROM student_years h
    JOIN (SELECT id, lead(id) OVER w AS next_id, lead(current) OVER w AS next_current
      FROM school_years WINDOW w AS (ORDER BY starts_on)) y ON y.id = h.school_year_id
    JOIN students s ON s.id = h.student_id
    LEFT JOIN student_years later
      ON later.student_id = h.student_id AND later.school_year_id = y.next_id
  ) c
  WHERE sy.student_id = c.student_id AND sy.school_year_id = c.school_year_id
    AND sy.continued IS DISTINCT FROM c.continued;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_years_continued_on_status() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  PERFORM refresh_student_continued(NEW.id);
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER students_status_continued
AFTER UPDATE OF status ON students
FOR EACH ROW WHEN (OLD.status IS DISTINCT FROM NEW.status)
EXECUTE FUNCTION student_years_continued_on_status();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_years_continued_all() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  PERFORM refresh_student_years_continued();
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER school_years_continued
AFTER INSERT OR DELETE OR UPDATE OF starts_on, current ON school_years
FOR EACH STATEMENT EXECUTE FUNCTION student_years_continued_all();
--> statement-breakpoint
CREATE TRIGGER student_years_history_continued
AFTER INSERT OR DELETE OR UPDATE OF outcome, school_year_id, student_id ON student_years
FOR EACH STATEMENT EXECUTE FUNCTION student_years_continued_all();
--> statement-breakpoint
SELECT refresh_student_years_continued();
--> statement-breakpoint
-- Fired in every session role, as the other triggers of ours (migration 0007): a roster import's
-- transaction runs with session_replication_role = replica and must still keep this column.
ALTER TABLE students ENABLE ALWAYS TRIGGER students_status_continued;--> statement-breakpoint
ALTER TABLE school_years ENABLE ALWAYS TRIGGER school_years_continued;--> statement-breakpoint
ALTER TABLE student_years ENABLE ALWAYS TRIGGER student_years_history_continued;
