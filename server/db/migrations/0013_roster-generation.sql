-- Custom SQL migration file, put your code below! --
-- roster_generation moves on with every statement that writes what a roster import compares
-- against (students, their seats, ensembles, schools, school years). An import reads it before
-- and after its snapshot and again inside its write transaction; when it has not moved, the
-- snapshot still holds and the transaction writes only the rows the plan found different.
-- A sequence, not a counter row: nextval never waits for another transaction's lock, and a
-- rolled-back write still moves it, which only costs the next import its short cut.
CREATE SEQUENCE roster_generation;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION roster_generation_next() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM nextval('roster_generation');
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER students_roster_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON students
  FOR EACH STATEMENT EXECUTE FUNCTION roster_generation_next();
--> statement-breakpoint
CREATE TRIGGER enrollments_roster_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON enrollments
  FOR EACH STATEMENT EXECUTE FUNCTION roster_generation_next();
--> statement-breakpoint
CREATE TRIGGER ensembles_roster_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ensembles
  FOR EACH STATEMENT EXECUTE FUNCTION roster_generation_next();
--> statement-breakpoint
CREATE TRIGGER schools_roster_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON schools
  FOR EACH STATEMENT EXECUTE FUNCTION roster_generation_next();
--> statement-breakpoint
CREATE TRIGGER school_years_roster_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON school_years
  FOR EACH STATEMENT EXECUTE FUNCTION roster_generation_next();
--> statement-breakpoint
-- Fired whatever the session's replication role (an import skips the per-row foreign-key
-- checks with it, migration 0007 says why).
ALTER TABLE students ENABLE ALWAYS TRIGGER students_roster_generation;
--> statement-breakpoint
ALTER TABLE enrollments ENABLE ALWAYS TRIGGER enrollments_roster_generation;
--> statement-breakpoint
ALTER TABLE ensembles ENABLE ALWAYS TRIGGER ensembles_roster_generation;
--> statement-breakpoint
ALTER TABLE schools ENABLE ALWAYS TRIGGER schools_roster_generation;
--> statement-breakpoint
ALTER TABLE school_years ENABLE ALWAYS TRIGGER school_years_roster_generation;
