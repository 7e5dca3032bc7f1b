-- Search (src/lib/server/search.ts, builds/list.ts relevancePage).
-- 1. The relevance order ranks a small vector, title (A) and summary (B) only, through its own RUM index,
--    instead of RUM scoring every match of the full vector (thousands of step texts) before the first
--    row. The full vector keeps its GIN index for matching; its RUM index goes (it was the ranking's).
DROP INDEX IF EXISTS "build_search_rum_idx";--> statement-breakpoint
ALTER TABLE "build" ADD COLUMN IF NOT EXISTS "search_head" "tsvector" GENERATED ALWAYS AS (setweight(to_tsvector('english', coalesce("build"."title", '')), 'A') || setweight(to_tsvector('english', coalesce("build"."summary", '')), 'B')) STORED NOT NULL;--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "build_search_head_rum_idx" ON "build" USING rum ("search_head" rum_tsvector_ops);--> statement-breakpoint
-- 2. The full vector is no longer a generated column (PostgreSQL recomputes those on EVERY update of the
--    row — also when migration 0004's triggers only touch view_changed_at for a new comment — re-parsing
--    up to 200,000 characters and writing a new TOASTed value). A trigger keeps it: on insert, and on an
--    update only when title, summary, search text (or the vector itself) really change. The values stay
--    what the generated column computed. ENABLE ALWAYS: it also runs under session_replication_role =
--    replica (scripts/seed-large.js bulk-loads that way), as the generated column did.
ALTER TABLE "build" ALTER COLUMN "search" DROP EXPRESSION IF EXISTS;--> statement-breakpoint
CREATE OR REPLACE FUNCTION starground_build_search_vector() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	NEW.search := setweight(to_tsvector('english', coalesce(NEW.title, '')), 'A')
		|| setweight(to_tsvector('english', coalesce(NEW.summary, '')), 'B')
		|| setweight(to_tsvector('english', coalesce(NEW.search_text, '')), 'C');
	RETURN NEW;
END $$;--> statement-breakpoint
DROP TRIGGER IF EXISTS build_search_vector_ins ON "build";--> statement-breakpoint
DROP TRIGGER IF EXISTS build_search_vector_upd ON "build";--> statement-breakpoint
CREATE TRIGGER build_search_vector_ins BEFORE INSERT ON "build" FOR EACH ROW EXECUTE FUNCTION starground_build_search_vector();--> statement-breakpoint
CREATE TRIGGER build_search_vector_upd BEFORE UPDATE OF title, summary, search_text, search ON "build" FOR EACH ROW
	WHEN (OLD.title IS DISTINCT FROM NEW.title OR OLD.summary IS DISTINCT FROM NEW.summary
		OR OLD.search_text IS DISTINCT FROM NEW.search_text OR OLD.search IS DISTINCT FROM NEW.search)
	EXECUTE FUNCTION starground_build_search_vector();--> statement-breakpoint
ALTER TABLE "build" ENABLE ALWAYS TRIGGER build_search_vector_ins;--> statement-breakpoint
ALTER TABLE "build" ENABLE ALWAYS TRIGGER build_search_vector_upd;--> statement-breakpoint
-- The planner needs the new column's statistics for its first search plans.
ANALYZE "build";
