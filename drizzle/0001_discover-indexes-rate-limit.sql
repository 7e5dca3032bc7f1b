CREATE TABLE "api_rate_limit" (
	"key" text PRIMARY KEY NOT NULL,
	"points" integer DEFAULT 0 NOT NULL,
	"expire" timestamp with time zone
);
--> statement-breakpoint
CREATE INDEX "build_published_derived_idx" ON "build" USING btree ("derived_count" DESC NULLS LAST,"published_at" DESC NULLS LAST,"id" DESC NULLS LAST) WHERE "build"."status" = 'published';--> statement-breakpoint
CREATE INDEX "build_published_reviewed_idx" ON "build" USING btree ((coalesce("last_reviewed_at", '-infinity'::timestamp)) desc,"published_at" DESC NULLS LAST,"id" DESC NULLS LAST) WHERE "build"."status" = 'published';