CREATE TYPE "public"."site_role" AS ENUM('admin', 'member');--> statement-breakpoint
CREATE TYPE "public"."groove_visibility" AS ENUM('private', 'link', 'public');--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" text,
	"action" text NOT NULL,
	"groove_id" text,
	"version_id" text,
	"details" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "groove_versions" (
	"id" text PRIMARY KEY NOT NULL,
	"groove_id" text NOT NULL,
	"number" integer NOT NULL,
	"document" jsonb NOT NULL,
	"content_hash" text NOT NULL,
	"author_id" text,
	"message" text DEFAULT '' NOT NULL,
	"parent_version_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "groove_versions_number_positive" CHECK ("groove_versions"."number" >= 1)
);
--> statement-breakpoint
CREATE TABLE "grooves" (
	"id" text PRIMARY KEY NOT NULL,
	"owner_id" text NOT NULL,
	"title" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"tags" text[] DEFAULT '{}'::text[] NOT NULL,
	"visibility" "groove_visibility" DEFAULT 'private' NOT NULL,
	"latest_version_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"deleted_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "sessions" (
	"id" text PRIMARY KEY NOT NULL,
	"user_id" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"display_name" text NOT NULL,
	"password_hash" text NOT NULL,
	"site_role" "site_role" DEFAULT 'member' NOT NULL,
	"email_verified_at" timestamp with time zone,
	"disabled_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_lower" CHECK ("users"."email" = lower("users"."email"))
);
--> statement-breakpoint
ALTER TABLE "groove_versions" ADD CONSTRAINT "groove_versions_groove_id_grooves_id_fk" FOREIGN KEY ("groove_id") REFERENCES "public"."grooves"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "groove_versions" ADD CONSTRAINT "groove_versions_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "groove_versions" ADD CONSTRAINT "groove_versions_parent_version_id_groove_versions_id_fk" FOREIGN KEY ("parent_version_id") REFERENCES "public"."groove_versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "grooves" ADD CONSTRAINT "grooves_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "grooves" ADD CONSTRAINT "grooves_latest_version_id_groove_versions_id_fk" FOREIGN KEY ("latest_version_id") REFERENCES "public"."groove_versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sessions" ADD CONSTRAINT "sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "audit_events_groove_idx" ON "audit_events" USING btree ("groove_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "groove_versions_groove_number_unique" ON "groove_versions" USING btree ("groove_id","number");--> statement-breakpoint
CREATE INDEX "grooves_owner_idx" ON "grooves" USING btree ("owner_id","updated_at");--> statement-breakpoint
CREATE INDEX "grooves_visibility_idx" ON "grooves" USING btree ("visibility");--> statement-breakpoint
CREATE INDEX "sessions_user_idx" ON "sessions" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_unique" ON "users" USING btree ("email");