-- A review is of the PUBLISHED revision (reviews/pinned.ts): the review desk row now counts the DANGER/CAUTION
-- checks, and takes the mains flag and category, from the latest revision's snapshot (build_revision where
-- number = build.revision), as the review page shows them. The maker's pending (unpublished) edits no longer
-- move the desk's counts. A build without a revision row (older data) keeps its live rows, as the review page does.
CREATE FUNCTION review_request_array(j jsonb) RETURNS jsonb LANGUAGE sql IMMUTABLE AS $$
	SELECT CASE WHEN jsonb_typeof(j) = 'array' THEN j ELSE '[]'::jsonb END
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION review_request_counts(bid uuid, lvl text) RETURNS integer LANGUAGE sql STABLE AS $$
	SELECT CASE WHEN r.snapshot IS NOT NULL THEN
		((SELECT count(*) FROM jsonb_array_elements(review_request_array(r.snapshot->'specBlocks')) sb,
			jsonb_array_elements(review_request_array(sb->'checks')) c WHERE c->>'level' = lvl)
		+ (SELECT count(*) FROM jsonb_array_elements(review_request_array(r.snapshot->'parts')) pl,
			jsonb_array_elements(review_request_array(pl->'checks')) c WHERE c->>'level' = lvl))::int
	ELSE
		((SELECT count(*) FROM spec_block sb, jsonb_array_elements(sb.checks) c WHERE sb.build_id = bid AND c->>'level' = lvl)
		+ (SELECT count(*) FROM part_line pl, jsonb_array_elements(pl.checks) c WHERE pl.build_id = bid AND c->>'level' = lvl))::int
	END
	FROM build b LEFT JOIN build_revision r ON r.build_id = b.id AND r.number = b.revision
	WHERE b.id = bid
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION review_request_sync(bid uuid) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
	IF EXISTS (SELECT 1 FROM build WHERE id = bid AND review_requested_at IS NOT NULL) THEN
		INSERT INTO review_request AS rr (build_id, requested_at, mains_powered, category, danger_checks, caution_checks, rereview)
		SELECT b.id, date_trunc('milliseconds', b.review_requested_at),
			coalesce((CASE WHEN jsonb_typeof(r.snapshot->'build'->'mainsPowered') = 'boolean' THEN (r.snapshot->'build'->>'mainsPowered')::boolean END), b.mains_powered),
			coalesce(CASE WHEN jsonb_typeof(r.snapshot->'build'->'category') = 'string' THEN r.snapshot->'build'->>'category' END, b.category),
			review_request_counts(b.id, 'danger'), review_request_counts(b.id, 'caution'),
			EXISTS (SELECT 1 FROM review rv WHERE rv.build_id = b.id)
		FROM build b LEFT JOIN build_revision r ON r.build_id = b.id AND r.number = b.revision
		WHERE b.id = bid
		ON CONFLICT (build_id) DO UPDATE SET
			requested_at = excluded.requested_at, mains_powered = excluded.mains_powered, category = excluded.category,
			danger_checks = excluded.danger_checks, caution_checks = excluded.caution_checks;
	ELSE
		DELETE FROM review_request WHERE build_id = bid;
	END IF;
END $$;
--> statement-breakpoint
-- Publishing a revision (build.revision moves) re-reads the desk row.
CREATE OR REPLACE FUNCTION review_request_build_trg() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'INSERT' THEN
		IF NEW.review_requested_at IS NOT NULL THEN PERFORM review_request_sync(NEW.id); END IF;
	ELSIF NEW.review_requested_at IS DISTINCT FROM OLD.review_requested_at
		OR NEW.mains_powered IS DISTINCT FROM OLD.mains_powered OR NEW.category IS DISTINCT FROM OLD.category
		OR NEW.revision IS DISTINCT FROM OLD.revision THEN
		PERFORM review_request_sync(NEW.id);
	END IF;
	RETURN NULL;
END $$;
--> statement-breakpoint
DROP TRIGGER review_request_build ON build;
--> statement-breakpoint
CREATE TRIGGER review_request_build AFTER INSERT OR UPDATE OF review_requested_at, mains_powered, category, revision ON build
	FOR EACH ROW EXECUTE FUNCTION review_request_build_trg();
--> statement-breakpoint
-- A revision's snapshot written or rewritten (a new revision; the stored checks recomputed by specs-recheck.ts).
CREATE FUNCTION review_request_revision_trg() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF EXISTS (SELECT 1 FROM review_request WHERE build_id = NEW.build_id) THEN PERFORM review_request_sync(NEW.build_id); END IF;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER review_request_revision AFTER INSERT OR UPDATE OF snapshot ON build_revision
	FOR EACH ROW EXECUTE FUNCTION review_request_revision_trg();
--> statement-breakpoint
-- Builds already waiting when this migration runs.
SELECT review_request_sync(id) FROM build WHERE review_requested_at IS NOT NULL;
