CREATE INDEX "grooves_title_idx" ON "grooves" USING btree (lower("title"),"id");--> statement-breakpoint
CREATE INDEX "grooves_created_idx" ON "grooves" USING btree ("created_at","id");