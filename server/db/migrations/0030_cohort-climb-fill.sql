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
