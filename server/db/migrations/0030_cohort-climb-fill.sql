-- Custom SQL migration file, put your code below! --
-- The summary row copies the student's cohort with their school, grade and status (the
-- functions of migrations 0006 and 0010, with the two cohort fields added).
CREATE OR REPLACE FUNCTION student_attainment_on_students_inserted() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO student_attainment (student_id, school_id, grade, active, stale, cohort_starts_on, cohort_grade)
  SELECT n.id, n.school_id, n.grade, n.status = 'active', true, n.cohort_starts_on, n.cohort_grade
  FROM inserted_students n;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_attainment_on_students_updated() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE student_attainment a
    SET school_id = n.school_id, grade = n.grade, active = n.status = 'active',
      cohort_starts_on = n.cohort_starts_on, cohort_grade = n.cohort_grade
    FROM updated_students n
    WHERE a.student_id = n.id
      AND (a.school_id IS DISTINCT FROM n.school_id OR a.grade IS DISTINCT FROM n.grade
        OR a.active IS DISTINCT FROM (n.status = 'active')
        OR a.cohort_starts_on IS DISTINCT FROM n.cohort_starts_on
        OR a.cohort_grade IS DISTINCT FROM n.cohort_grade);
  RETURN NULL;
END $$;
--> statement-breakpoint
-- Every student's cohort (the first closed year they played in, and their grade then) and the
-- cohorts' rungs at the end of each closed year, worked out again from the history. The start of
-- a year writes both for the year it closes without this; a seed that writes history calls it.
CREATE OR REPLACE FUNCTION refresh_cohort_climb() RETURNS void LANGUAGE sql AS $$
  UPDATE students s SET cohort_starts_on = f.starts_on, cohort_grade = f.grade
  FROM (
    SELECT DISTINCT ON (sy.student_id) sy.student_id, y.starts_on, sy.grade
    FROM student_years sy JOIN school_years y ON y.id = sy.school_year_id
    WHERE sy.outcome <> 'withdrawn'
    ORDER BY sy.student_id, y.starts_on
  ) f
  WHERE s.id = f.student_id
    AND (s.cohort_starts_on IS DISTINCT FROM f.starts_on OR s.cohort_grade IS DISTINCT FROM f.grade);
  DELETE FROM cohort_rungs;
  INSERT INTO cohort_rungs (cohort_starts_on, cohort_grade, year_starts_on, school_id, rung, students)
  SELECT s.cohort_starts_on, s.cohort_grade, y.starts_on, sy.school_id, sy.rung, count(*)::int
  FROM student_years sy
  JOIN school_years y ON y.id = sy.school_year_id
  JOIN students s ON s.id = sy.student_id
  WHERE sy.outcome <> 'withdrawn'
  GROUP BY 1, 2, 3, 4, 5;
$$;
--> statement-breakpoint
SELECT refresh_cohort_climb();
