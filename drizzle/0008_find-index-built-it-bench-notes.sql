CREATE TABLE "build_report" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"build_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"based_on_id" uuid,
	"note" text DEFAULT '' NOT NULL,
	"blocks" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"photo_id" uuid,
	"created_at" timestamp DEFAULT now() NOT NULL,
	"updated_at" timestamp DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "published_figure" (
	"build_id" uuid NOT NULL,
	"block" integer NOT NULL,
	"kind" text NOT NULL,
	"rail_v" double precision,
	"load_ohm" double precision,
	"power_w" double precision,
	CONSTRAINT "published_figure_build_id_block_pk" PRIMARY KEY("build_id","block")
);
--> statement-breakpoint
CREATE TABLE "published_part" (
	"build_id" uuid NOT NULL,
	"line" integer NOT NULL,
	"kind" text NOT NULL,
	"value" double precision,
	"value_key" text NOT NULL,
	"package_key" text NOT NULL,
	CONSTRAINT "published_part_build_id_line_pk" PRIMARY KEY("build_id","line")
);
--> statement-breakpoint
ALTER TABLE "bench_item" ADD COLUMN "note" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "build_report" ADD CONSTRAINT "build_report_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_report" ADD CONSTRAINT "build_report_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_report" ADD CONSTRAINT "build_report_based_on_id_build_id_fk" FOREIGN KEY ("based_on_id") REFERENCES "public"."build"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_report" ADD CONSTRAINT "build_report_photo_id_photo_id_fk" FOREIGN KEY ("photo_id") REFERENCES "public"."photo"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "published_figure" ADD CONSTRAINT "published_figure_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "published_part" ADD CONSTRAINT "published_part_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "build_report_member_idx" ON "build_report" USING btree ("build_id","user_id");--> statement-breakpoint
CREATE INDEX "build_report_user_idx" ON "build_report" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "published_figure_rail_idx" ON "published_figure" USING btree ("rail_v","build_id");--> statement-breakpoint
CREATE INDEX "published_figure_load_idx" ON "published_figure" USING btree ("load_ohm","build_id");--> statement-breakpoint
CREATE INDEX "published_figure_power_idx" ON "published_figure" USING btree ("power_w","build_id");--> statement-breakpoint
CREATE INDEX "published_part_value_idx" ON "published_part" USING btree ("kind","value","build_id");--> statement-breakpoint
CREATE INDEX "published_part_text_idx" ON "published_part" USING btree ("kind","value_key","build_id");--> statement-breakpoint
CREATE INDEX "published_part_package_idx" ON "published_part" USING btree ("package_key","build_id");--> statement-breakpoint
-- Fill the find index of builds published before it existed (the same rows refreshFindIndex(db, null) writes; src/lib/server/builds/find-index.ts).
INSERT INTO "published_figure" ("build_id", "block", "kind", "rail_v", "load_ohm", "power_w")
SELECT b.id, e.ord::int - 1, e.blk->>'kind',
	CASE WHEN e.blk->>'kind' = 'amplifier'
		THEN (CASE WHEN jsonb_typeof(e.blk->'data'->'railV') = 'number' THEN (e.blk->'data'->'railV')::float8 END) / (CASE WHEN e.blk->'data'->>'supply' = 'single' THEN 2 ELSE 1 END)
		ELSE (CASE WHEN jsonb_typeof(e.blk->'derived'->'averageDcV') = 'number' THEN (e.blk->'derived'->'averageDcV')::float8 END)
			/ (CASE WHEN jsonb_typeof(e.blk->'derived'->'railCount') = 'number' AND (e.blk->'derived'->'railCount')::float8 = 2 THEN 1 ELSE 2 END)
	END,
	CASE WHEN e.blk->>'kind' = 'amplifier' AND jsonb_typeof(e.blk->'data'->'loadOhm') = 'number' THEN (e.blk->'data'->'loadOhm')::float8 END,
	CASE WHEN e.blk->>'kind' = 'amplifier' THEN coalesce(
		(CASE WHEN jsonb_typeof(e.blk->'data'->'claimed'->'powerW') = 'number' THEN (e.blk->'data'->'claimed'->'powerW')::float8 END),
		(CASE WHEN jsonb_typeof(e.blk->'derived'->'maxPowerW') = 'number' THEN (e.blk->'derived'->'maxPowerW')::float8 END)) END
FROM "build" b
JOIN "build_revision" r ON r.build_id = b.id AND r.number = b.revision
CROSS JOIN LATERAL jsonb_array_elements(CASE WHEN jsonb_typeof(r.snapshot->'specBlocks') = 'array' THEN r.snapshot->'specBlocks' ELSE '[]'::jsonb END) WITH ORDINALITY e(blk, ord)
WHERE b.revision > 0 AND e.blk->>'kind' IN ('amplifier', 'supply');--> statement-breakpoint
INSERT INTO "published_part" ("build_id", "line", "kind", "value", "value_key", "package_key")
SELECT b.id, e.ord::int - 1, coalesce(e.p->>'kind', 'other'),
	(CASE WHEN jsonb_typeof(e.p->'value') = 'number' THEN (e.p->'value')::float8 END),
	lower(regexp_replace(btrim(coalesce(e.p->>'valueText', '')), '\s+', ' ', 'g')),
	lower(regexp_replace(btrim(coalesce(e.p->>'package', '')), '\s+', ' ', 'g'))
FROM "build" b
JOIN "build_revision" r ON r.build_id = b.id AND r.number = b.revision
CROSS JOIN LATERAL jsonb_array_elements(CASE WHEN jsonb_typeof(r.snapshot->'parts') = 'array' THEN r.snapshot->'parts' ELSE '[]'::jsonb END) WITH ORDINALITY e(p, ord)
WHERE b.revision > 0 AND jsonb_typeof(e.p) = 'object';
--> statement-breakpoint
-- "I built this too" records show on the build page: its reader cache follows them (0004's triggers).
SELECT starground_watch_build_rows('build_report');
