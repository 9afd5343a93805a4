-- Summary rows written before student_attainment.rung_dates existed: marked stale, so the next
-- read recomputes them (rung dates included) through the ladder rules. A student still on
-- rung 0 has no rung dates to fill.
UPDATE student_attainment SET stale = true WHERE rung > 0 AND rung_dates IS NULL;
