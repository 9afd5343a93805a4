CREATE INDEX "enrollments_instrument_idx" ON "enrollments" USING btree ("instrument_id","school_year_id");--> statement-breakpoint
CREATE INDEX "students_first_name_idx" ON "students" USING btree ("first_name","last_name","id");--> statement-breakpoint
CREATE INDEX "students_status_idx" ON "students" USING btree ("status","last_name","first_name","id");--> statement-breakpoint
CREATE INDEX "students_updated_idx" ON "students" USING btree ("updated_at","id");--> statement-breakpoint
CREATE INDEX "students_first_name_search_idx" ON "students" USING btree (lower("first_name") text_pattern_ops);--> statement-breakpoint
CREATE INDEX "students_preferred_name_search_idx" ON "students" USING btree (lower("preferred_name") text_pattern_ops);--> statement-breakpoint
CREATE INDEX "students_number_search_idx" ON "students" USING btree (lower("student_number") text_pattern_ops);