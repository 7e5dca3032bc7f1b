CREATE TABLE "build_attachment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"build_id" uuid NOT NULL,
	"owner_id" text NOT NULL,
	"kind" text NOT NULL,
	"name" text NOT NULL,
	"ext" text NOT NULL,
	"mime" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"key" text NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "build_attachment" ADD CONSTRAINT "build_attachment_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_attachment" ADD CONSTRAINT "build_attachment_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "build_attachment_build_idx" ON "build_attachment" USING btree ("build_id","position");--> statement-breakpoint
-- The build page lists a build's files: changes to them move the build's view version (0004's reader cache).
SELECT starground_watch_build_rows('build_attachment');
