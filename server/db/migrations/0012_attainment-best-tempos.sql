DROP INDEX "student_attainment_inactive_idx";--> statement-breakpoint
ALTER TABLE "student_attainment" ADD COLUMN "best_tempos" smallint[];--> statement-breakpoint
-- Fill the new column for the summary rows already written: each student's fastest passed tempo
-- per requirement of their row's ladder version, by code in "C" order (bestTempoCodes).
UPDATE "student_attainment" a SET "best_tempos" = t."tempos"
FROM (
  SELECT s."student_id", array_agg(p."best_tempo" ORDER BY q."code" COLLATE "C") AS "tempos"
  FROM "student_attainment" s
  JOIN (SELECT DISTINCT "ladder_version_id", "code" FROM "ladder_requirements") q
    ON q."ladder_version_id" = s."ladder_version_id"
  LEFT JOIN "passed_requirements" p
    ON p."student_id" = s."student_id" AND p."requirement_code" = q."code"
  GROUP BY s."student_id"
) t
WHERE t."student_id" = a."student_id";
