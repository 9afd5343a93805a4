-- Custom SQL migration file, put your code below! --
-- Every student's cohort (the first closed year they played in, and their grade then), the
-- cohorts' rungs at the end of each closed year, and each history row's rung dates, worked out
-- again from the history and the summary rows. The start of a year writes all three for the
-- year it closes without this; the demo seed, which writes a closed year directly, calls it.
-- Rung dates are cumulative, so the current ones answer any day of a closed year as a copy taken
-- at its close would, for the same ladder.
CREATE OR REPLACE FUNCTION refresh_history_summaries() RETURNS void LANGUAGE sql AS $$
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
  UPDATE student_years sy SET rung_dates = a.rung_dates
  FROM student_attainment a
  WHERE a.student_id = sy.student_id AND sy.rung_dates IS DISTINCT FROM a.rung_dates;
$$;
--> statement-breakpoint
SELECT refresh_history_summaries();
