-- Custom SQL migration file, put your code below! --
-- A new student cannot have a summary row yet (student_attainment.student_id references
-- students.id, and ids are never reused), so the insert trigger adds rows with a plain INSERT:
-- PostgreSQL's ON CONFLICT checks each row against the key first, which cost a roster import
-- about a third of its time on 18,000 new students.
CREATE OR REPLACE FUNCTION student_attainment_on_students_inserted() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO student_attainment (student_id, school_id, grade, active, stale)
  SELECT n.id, n.school_id, n.grade, n.status = 'active', true FROM inserted_students n;
  RETURN NULL;
END $$;
