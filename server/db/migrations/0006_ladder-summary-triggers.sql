-- Custom SQL migration file, put your code below! --
-- student_attainment copies each student's school, grade and status so the Overview reads one
-- table; these statement-level triggers (PostgreSQL CREATE TRIGGER ... REFERENCING ... FOR EACH
-- STATEMENT) keep the copy exact, and mark a student stale when their seats change.
CREATE OR REPLACE FUNCTION student_attainment_on_students_inserted() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO student_attainment (student_id, school_id, grade, active, stale)
  SELECT n.id, n.school_id, n.grade, n.status = 'active', true FROM inserted_students n
  ON CONFLICT (student_id) DO UPDATE
    SET school_id = excluded.school_id, grade = excluded.grade, active = excluded.active, stale = true;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER student_attainment_students_inserted AFTER INSERT ON students
  REFERENCING NEW TABLE AS inserted_students
  FOR EACH STATEMENT EXECUTE FUNCTION student_attainment_on_students_inserted();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_attainment_on_students_updated() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE student_attainment a
    SET school_id = n.school_id, grade = n.grade, active = n.status = 'active'
    FROM updated_students n
    WHERE a.student_id = n.id
      AND (a.school_id IS DISTINCT FROM n.school_id OR a.grade IS DISTINCT FROM n.grade
        OR a.active IS DISTINCT FROM (n.status = 'active'));
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER student_attainment_students_updated AFTER UPDATE ON students
  REFERENCING NEW TABLE AS updated_students
  FOR EACH STATEMENT EXECUTE FUNCTION student_attainment_on_students_updated();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_attainment_on_seats_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE student_attainment a SET stale = true
    FROM (SELECT DISTINCT student_id FROM changed_seats) c
    WHERE a.student_id = c.student_id AND NOT a.stale;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER student_attainment_seats_inserted AFTER INSERT ON enrollments
  REFERENCING NEW TABLE AS changed_seats
  FOR EACH STATEMENT EXECUTE FUNCTION student_attainment_on_seats_changed();
--> statement-breakpoint
CREATE TRIGGER student_attainment_seats_updated AFTER UPDATE ON enrollments
  REFERENCING NEW TABLE AS changed_seats
  FOR EACH STATEMENT EXECUTE FUNCTION student_attainment_on_seats_changed();
--> statement-breakpoint
CREATE TRIGGER student_attainment_seats_deleted AFTER DELETE ON enrollments
  REFERENCING OLD TABLE AS changed_seats
  FOR EACH STATEMENT EXECUTE FUNCTION student_attainment_on_seats_changed();
--> statement-breakpoint
-- Students already on the roster get their row now; it is computed before the next read.
INSERT INTO student_attainment (student_id, school_id, grade, active, stale)
  SELECT s.id, s.school_id, s.grade, s.status = 'active', true FROM students s
  ON CONFLICT (student_id) DO UPDATE
    SET school_id = excluded.school_id, grade = excluded.grade, active = excluded.active, stale = true;
