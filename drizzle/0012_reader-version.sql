CREATE TABLE "reader_version" (
	"id" integer PRIMARY KEY DEFAULT 1 NOT NULL,
	"version" bigint DEFAULT 0 NOT NULL,
	"changed_at" timestamp (3) DEFAULT now() NOT NULL,
	CONSTRAINT "reader_version_one_row" CHECK ("reader_version"."id" = 1)
);
--> statement-breakpoint
-- Reader list caches (src/lib/server/builds/list-cache.ts): one row whose version moves once per
-- transaction that inserts, changes or deletes a build that is not a draft. Every change a list shows
-- (maker names, covers, reviews, hazard tags, lineage, search text, find index) touches its build row
-- (migration 0004), so this one number tells every app instance sharing the database whether what it
-- keeps is still current. The triggers are deferred to commit: the row is locked only while a writing
-- transaction commits, not for its whole length.
INSERT INTO "reader_version" ("id") VALUES (1) ON CONFLICT DO NOTHING;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION starground_reader_version_bump() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF current_setting('starground.reader_version_tx', true) IS DISTINCT FROM txid_current()::text THEN
		UPDATE "reader_version" SET version = version + 1, changed_at = clock_timestamp() WHERE id = 1;
		PERFORM set_config('starground.reader_version_tx', txid_current()::text, true);
	END IF;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER build_reader_version_ins AFTER INSERT ON "build" DEFERRABLE INITIALLY DEFERRED
	FOR EACH ROW WHEN (NEW.status <> 'draft') EXECUTE FUNCTION starground_reader_version_bump();
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER build_reader_version_upd AFTER UPDATE ON "build" DEFERRABLE INITIALLY DEFERRED
	FOR EACH ROW WHEN (OLD.status <> 'draft' OR NEW.status <> 'draft') EXECUTE FUNCTION starground_reader_version_bump();
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER build_reader_version_del AFTER DELETE ON "build" DEFERRABLE INITIALLY DEFERRED
	FOR EACH ROW WHEN (OLD.status <> 'draft') EXECUTE FUNCTION starground_reader_version_bump();
