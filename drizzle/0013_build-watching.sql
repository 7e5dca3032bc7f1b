CREATE TABLE "build_watch" (
	"build_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"created_at" timestamp DEFAULT now() NOT NULL,
	CONSTRAINT "build_watch_build_id_user_id_pk" PRIMARY KEY("build_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "user" ADD COLUMN "notify_comment" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "user" ADD COLUMN "notify_revision" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "build_watch" ADD CONSTRAINT "build_watch_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_watch" ADD CONSTRAINT "build_watch_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "build_watch_user_idx" ON "build_watch" USING btree ("user_id");