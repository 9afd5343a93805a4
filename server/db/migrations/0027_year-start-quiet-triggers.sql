-- Three summaries need no row-by-row upkeep while a new school year is started, which sets
-- tutti.year_start = 'on' for its own transaction only (PostgreSQL set_config(..., true), read
-- with current_setting(name, true), which answers NULL when the setting was never made):
-- * a carried seat has the instrument of the seat it continues, so the student's family and rung
--   stay as they are: no need to mark 48,000 summary rows stale;
-- * student_years.continued is recomputed once, at the start's end (refresh_student_years_continued),
--   instead of in full after each of its statements and once per student whose status changes.
CREATE OR REPLACE FUNCTION student_attainment_on_seats_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF current_setting('tutti.year_start', true) = 'on' THEN RETURN NULL; END IF;
  UPDATE student_attainment a SET stale = true
    FROM (SELECT DISTINCT student_id FROM changed_seats) c
    WHERE a.student_id = c.student_id AND NOT a.stale;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_years_continued_on_status() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF current_setting('tutti.year_start', true) = 'on' THEN RETURN NULL; END IF;
  PERFORM refresh_student_continued(NEW.id);
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION student_years_continued_all() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF current_setting('tutti.year_start', true) = 'on' THEN RETURN NULL; END IF;
  PERFORM refresh_student_years_continued();
  RETURN NULL;
END;
$$;
