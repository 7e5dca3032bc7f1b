ALTER TABLE "build" ADD COLUMN "pending_changes_at" timestamp;--> statement-breakpoint
ALTER TABLE "build_revision" ADD COLUMN "note" text DEFAULT '' NOT NULL;