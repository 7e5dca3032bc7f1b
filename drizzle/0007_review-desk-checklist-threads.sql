CREATE TABLE "flag_message" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"flag_id" uuid NOT NULL,
	"author_id" text NOT NULL,
	"body_md" text NOT NULL,
	"body_html" text NOT NULL,
	"created_at" timestamp DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "review_request" (
	"build_id" uuid PRIMARY KEY NOT NULL,
	"requested_at" timestamp NOT NULL,
	"mains_powered" boolean NOT NULL,
	"category" text NOT NULL,
	"danger_checks" integer DEFAULT 0 NOT NULL,
	"caution_checks" integer DEFAULT 0 NOT NULL,
	"rereview" boolean DEFAULT false NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"claimed_by_id" text,
	"claimed_at" timestamp
);
--> statement-breakpoint
CREATE TABLE "reviewer_setting" (
	"user_id" text PRIMARY KEY NOT NULL,
	"categories" text[] DEFAULT '{}'::text[] NOT NULL,
	"digest_sent_at" timestamp
);
--> statement-breakpoint
ALTER TABLE "review" ADD COLUMN "checklist" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "review" ADD COLUMN "checklist_note" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "safety_flag" ADD COLUMN "resolved_note" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "flag_message" ADD CONSTRAINT "flag_message_flag_id_safety_flag_id_fk" FOREIGN KEY ("flag_id") REFERENCES "public"."safety_flag"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag_message" ADD CONSTRAINT "flag_message_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_request" ADD CONSTRAINT "review_request_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_request" ADD CONSTRAINT "review_request_claimed_by_id_user_id_fk" FOREIGN KEY ("claimed_by_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviewer_setting" ADD CONSTRAINT "reviewer_setting_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "flag_message_flag_idx" ON "flag_message" USING btree ("flag_id","created_at");--> statement-breakpoint
CREATE INDEX "review_request_oldest_idx" ON "review_request" USING btree ("requested_at","build_id");--> statement-breakpoint
CREATE INDEX "review_request_danger_idx" ON "review_request" USING btree ("danger_checks" DESC NULLS LAST,"requested_at","build_id");--> statement-breakpoint
CREATE INDEX "review_request_mains_idx" ON "review_request" USING btree ("requested_at","build_id") WHERE "review_request"."mains_powered";--> statement-breakpoint
CREATE INDEX "review_request_mains_danger_idx" ON "review_request" USING btree ("danger_checks" DESC NULLS LAST,"requested_at","build_id") WHERE "review_request"."mains_powered" and "review_request"."danger_checks" > 0;--> statement-breakpoint
CREATE INDEX "review_request_category_idx" ON "review_request" USING btree ("category","requested_at","build_id");--> statement-breakpoint
CREATE INDEX "reviewer_setting_categories_idx" ON "reviewer_setting" USING gin ("categories");--> statement-breakpoint
-- The review desk row of a build follows the build (reviews/desk.ts): present while review_requested_at is set,
-- with mains/category copied and the DANGER/CAUTION check counts of its spec blocks and part lines.
CREATE FUNCTION review_request_counts(bid uuid, lvl text) RETURNS integer LANGUAGE sql STABLE AS $$
	SELECT ((SELECT count(*) FROM spec_block sb, jsonb_array_elements(sb.checks) c WHERE sb.build_id = bid AND c->>'level' = lvl)
		+ (SELECT count(*) FROM part_line pl, jsonb_array_elements(pl.checks) c WHERE pl.build_id = bid AND c->>'level' = lvl))::int
$$;
--> statement-breakpoint
CREATE FUNCTION review_request_sync(bid uuid) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
	IF EXISTS (SELECT 1 FROM build WHERE id = bid AND review_requested_at IS NOT NULL) THEN
		INSERT INTO review_request AS rr (build_id, requested_at, mains_powered, category, danger_checks, caution_checks, rereview)
		SELECT b.id, date_trunc('milliseconds', b.review_requested_at), b.mains_powered, b.category,
			review_request_counts(b.id, 'danger'), review_request_counts(b.id, 'caution'),
			EXISTS (SELECT 1 FROM review r WHERE r.build_id = b.id)
		FROM build b WHERE b.id = bid
		ON CONFLICT (build_id) DO UPDATE SET
			requested_at = excluded.requested_at, mains_powered = excluded.mains_powered, category = excluded.category,
			danger_checks = excluded.danger_checks, caution_checks = excluded.caution_checks;
	ELSE
		DELETE FROM review_request WHERE build_id = bid;
	END IF;
END $$;
--> statement-breakpoint
CREATE FUNCTION review_request_build_trg() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'INSERT' THEN
		IF NEW.review_requested_at IS NOT NULL THEN PERFORM review_request_sync(NEW.id); END IF;
	ELSIF NEW.review_requested_at IS DISTINCT FROM OLD.review_requested_at
		OR NEW.mains_powered IS DISTINCT FROM OLD.mains_powered OR NEW.category IS DISTINCT FROM OLD.category THEN
		PERFORM review_request_sync(NEW.id);
	END IF;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER review_request_build AFTER INSERT OR UPDATE OF review_requested_at, mains_powered, category ON build
	FOR EACH ROW EXECUTE FUNCTION review_request_build_trg();
--> statement-breakpoint
CREATE FUNCTION review_request_checks_trg() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE bid uuid := CASE WHEN TG_OP = 'DELETE' THEN OLD.build_id ELSE NEW.build_id END;
BEGIN
	UPDATE review_request SET danger_checks = review_request_counts(bid, 'danger'), caution_checks = review_request_counts(bid, 'caution')
		WHERE build_id = bid;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER review_request_spec_checks AFTER INSERT OR UPDATE OF checks OR DELETE ON spec_block
	FOR EACH ROW EXECUTE FUNCTION review_request_checks_trg();
--> statement-breakpoint
CREATE TRIGGER review_request_part_checks AFTER INSERT OR UPDATE OF checks OR DELETE ON part_line
	FOR EACH ROW EXECUTE FUNCTION review_request_checks_trg();
--> statement-breakpoint
-- Builds already waiting when this migration runs.
SELECT review_request_sync(id) FROM build WHERE review_requested_at IS NOT NULL;
