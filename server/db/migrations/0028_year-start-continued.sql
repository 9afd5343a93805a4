-- Custom SQL migration file, put your code below! --
-- The start of a new school year writes each history row of the year it closes with its
-- `continued` already known (a student promoted or moving up is active in the new year; one who
-- graduated, left or withdrew is not), so it needs no full refresh of student_years at its end:
-- only the year before the closed one is looked at again, with this one-year refresh.
CREATE OR REPLACE FUNCTION refresh_student_years_continued_of(p_year integer) RETURNS void
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
    WHERE h.school_year_id = p_year
  ) c
  WHERE sy.student_id = c.student_id AND sy.school_year_id = c.school_year_id
    AND sy.continued IS DISTINCT FROM c.continued;
$$;
--> statement-breakpoint
-- The status trigger tests the year start's setting in its WHEN condition (PostgreSQL CREATE
-- TRIGGER: "WHEN (condition)"), so the start's graduating and leaving students cost no call of
-- the trigger function at all; the function's own test stays for any other caller.
DROP TRIGGER students_status_continued ON students;
--> statement-breakpoint
CREATE TRIGGER students_status_continued
AFTER UPDATE OF status ON students
FOR EACH ROW WHEN (OLD.status IS DISTINCT FROM NEW.status
  AND current_setting('tutti.year_start', true) IS DISTINCT FROM 'on')
EXECUTE FUNCTION student_years_continued_on_status();
--> statement-breakpoint
ALTER TABLE students ENABLE ALWAYS TRIGGER students_status_continued;
