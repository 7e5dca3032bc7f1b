ALTER TABLE "build" ADD COLUMN "view_version" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "build" ADD COLUMN "view_changed_at" timestamp (3) DEFAULT now() NOT NULL;--> statement-breakpoint
-- Reader cache (src/lib/server/builds/reader-cache.ts): every write that changes what a reader of a
-- build page sees moves build.view_version (and view_changed_at), in the writing transaction, so every
-- app instance sharing this database sees the new version at once. Statement-level triggers with
-- transition tables: a bulk insert touches each build once.
CREATE OR REPLACE FUNCTION starground_build_view_bump() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	NEW.view_version := OLD.view_version + 1;
	NEW.view_changed_at := clock_timestamp();
	RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER build_view_bump BEFORE UPDATE ON "build" FOR EACH ROW EXECUTE FUNCTION starground_build_view_bump();
--> statement-breakpoint
-- Rows of a table with a build_id column changed: touch their builds (the BEFORE trigger above bumps them).
CREATE OR REPLACE FUNCTION starground_touch_builds_of_rows() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'INSERT' THEN
		UPDATE "build" SET view_changed_at = clock_timestamp() WHERE id IN (SELECT build_id FROM new_rows);
	ELSIF TG_OP = 'DELETE' THEN
		UPDATE "build" SET view_changed_at = clock_timestamp() WHERE id IN (SELECT build_id FROM old_rows);
	ELSE
		UPDATE "build" SET view_changed_at = clock_timestamp() WHERE id IN (SELECT build_id FROM new_rows UNION SELECT build_id FROM old_rows);
	END IF;
	RETURN NULL;
END $$;
--> statement-breakpoint
-- Attach the three statement triggers to a table whose rows (by build_id) a build page shows. A later
-- migration that adds such a table calls: SELECT starground_watch_build_rows('the_table');
CREATE OR REPLACE FUNCTION starground_watch_build_rows(tbl text) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
	EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION starground_touch_builds_of_rows()', tbl || '_view_ins', tbl);
	EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION starground_touch_builds_of_rows()', tbl || '_view_upd', tbl);
	EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION starground_touch_builds_of_rows()', tbl || '_view_del', tbl);
END $$;
--> statement-breakpoint
SELECT starground_watch_build_rows('build_step');
--> statement-breakpoint
SELECT starground_watch_build_rows('photo');
--> statement-breakpoint
SELECT starground_watch_build_rows('spec_block');
--> statement-breakpoint
SELECT starground_watch_build_rows('part_line');
--> statement-breakpoint
SELECT starground_watch_build_rows('build_revision');
--> statement-breakpoint
SELECT starground_watch_build_rows('review');
--> statement-breakpoint
SELECT starground_watch_build_rows('safety_flag');
--> statement-breakpoint
SELECT starground_watch_build_rows('comment');
--> statement-breakpoint
-- Lineage: a build's page lists the build it started from and the builds based on it (title, slug,
-- status, licence, maker). When one of those changes, touch the relatives.
CREATE OR REPLACE FUNCTION starground_touch_build_relatives() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF pg_trigger_depth() > 1 THEN RETURN NULL; END IF;
	IF TG_OP = 'DELETE' THEN
		UPDATE "build" SET view_changed_at = clock_timestamp()
		WHERE id IN (SELECT derived_from_id FROM old_rows WHERE derived_from_id IS NOT NULL);
		RETURN NULL;
	END IF;
	UPDATE "build" SET view_changed_at = clock_timestamp()
	WHERE id IN (
		WITH changed AS (
			SELECT n.id, n.derived_from_id FROM new_rows n JOIN old_rows o ON o.id = n.id
			WHERE (n.title, n.slug, n.status, n.licence, n.owner_id) IS DISTINCT FROM (o.title, o.slug, o.status, o.licence, o.owner_id)
		)
		SELECT derived_from_id FROM changed WHERE derived_from_id IS NOT NULL
		UNION SELECT c.id FROM "build" c JOIN changed ON c.derived_from_id = changed.id
	);
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER build_view_relatives_upd AFTER UPDATE ON "build" REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION starground_touch_build_relatives();
--> statement-breakpoint
CREATE TRIGGER build_view_relatives_del AFTER DELETE ON "build" REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION starground_touch_build_relatives();
--> statement-breakpoint
-- A member's name, handle, role, avatar or suspension shows on builds they made, commented on,
-- reviewed or tagged, and on the relatives of builds they made.
CREATE OR REPLACE FUNCTION starground_touch_builds_of_members() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	UPDATE "build" SET view_changed_at = clock_timestamp()
	WHERE id IN (
		WITH changed AS (
			SELECT n.id FROM new_rows n JOIN old_rows o ON o.id = n.id
			WHERE (n.name, n.handle, n.role, n.image, n.avatar_key, n.suspended_at) IS DISTINCT FROM (o.name, o.handle, o.role, o.image, o.avatar_key, o.suspended_at)
		)
		SELECT b.id FROM "build" b WHERE b.owner_id IN (SELECT id FROM changed)
		UNION SELECT c.id FROM "build" c JOIN "build" p ON c.derived_from_id = p.id WHERE p.owner_id IN (SELECT id FROM changed)
		UNION SELECT c.derived_from_id FROM "build" c WHERE c.derived_from_id IS NOT NULL AND c.owner_id IN (SELECT id FROM changed)
		UNION SELECT build_id FROM "comment" WHERE author_id IN (SELECT id FROM changed)
		UNION SELECT build_id FROM "review" WHERE reviewer_id IN (SELECT id FROM changed)
		UNION SELECT build_id FROM "safety_flag" WHERE raised_by_id IN (SELECT id FROM changed) OR resolved_by_id IN (SELECT id FROM changed)
	);
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER user_view_members_upd AFTER UPDATE ON "user" REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION starground_touch_builds_of_members();
