-- Custom SQL migration file, put your code below! --
-- The summary triggers fire whatever the session's replication role (PostgreSQL ALTER TABLE
-- ... ENABLE ALWAYS TRIGGER), so a bulk roster import may set session_replication_role =
-- replica to skip the per-row foreign-key checks and still keep student_attainment exact.
ALTER TABLE students ENABLE ALWAYS TRIGGER student_attainment_students_inserted;
--> statement-breakpoint
ALTER TABLE students ENABLE ALWAYS TRIGGER student_attainment_students_updated;
--> statement-breakpoint
ALTER TABLE enrollments ENABLE ALWAYS TRIGGER student_attainment_seats_inserted;
--> statement-breakpoint
ALTER TABLE enrollments ENABLE ALWAYS TRIGGER student_attainment_seats_updated;
--> statement-breakpoint
ALTER TABLE enrollments ENABLE ALWAYS TRIGGER student_attainment_seats_deleted;
