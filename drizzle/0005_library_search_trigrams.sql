-- pg_trgm ships with PostgreSQL (contrib) and is a trusted extension: no superuser needed since PostgreSQL 13.
CREATE EXTENSION IF NOT EXISTS pg_trgm;--> statement-breakpoint
CREATE INDEX "grooves_title_trgm_idx" ON "grooves" USING gin ("title" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "grooves_description_trgm_idx" ON "grooves" USING gin ("description" gin_trgm_ops);