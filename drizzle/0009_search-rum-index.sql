-- Search ranks inside the index (src/lib/server/search.ts searchDistance): the RUM extension, Debian's
-- postgresql-15-rum (npm start / npm test install it; a hosted PostgreSQL must offer the extension rum).
CREATE EXTENSION IF NOT EXISTS rum;--> statement-breakpoint
CREATE INDEX "build_search_rum_idx" ON "build" USING rum ("search" rum_tsvector_ops);