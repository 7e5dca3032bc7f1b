import { sql, type SQL } from 'drizzle-orm';
import {
	pgTable,
	text,
	timestamp,
	boolean,
	integer,
	doublePrecision,
	numeric,
	jsonb,
	uuid,
	index,
	uniqueIndex,
	primaryKey,
	customType,
	check,
	bigint,
	type AnyPgColumn
} from 'drizzle-orm/pg-core';
import { user } from './auth.schema';

export * from './auth.schema';

const tsvector = customType<{ data: string }>({ dataType: () => 'tsvector' });

/** A build: one maker's project, its steps, spec blocks and parts list. */
export const build = pgTable(
	'build',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		slug: text('slug').notNull().unique(),
		ownerId: text('owner_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		title: text('title').notNull(),
		summary: text('summary').default('').notNull(),
		category: text('category').notNull(),
		topology: text('topology').notNull(),
		mainsPowered: boolean('mains_powered').default(false).notNull(),
		licence: text('licence').default('CC-BY-SA-4.0').notNull(),
		coverPhotoId: uuid('cover_photo_id'),
		status: text('status').default('draft').notNull(),
		/** The maker's build status (on screen "Build status"): in-progress, working, abandoned ($lib/schemas/build BUILD_PROGRESS). */
		progress: text('progress').default('in-progress').notNull(),
		locked: boolean('locked').default(false).notNull(),
		lockedReason: text('locked_reason'),
		derivedFromId: uuid('derived_from_id').references((): AnyPgColumn => build.id, { onDelete: 'set null' }),
		/** Number of the latest published revision (Rev A = 1); 0 until first published. */
		revision: integer('revision').default(0).notNull(),
		/** Set when a published build is edited after its latest revision; cleared when the maker publishes the changes as one. */
		pendingChangesAt: timestamp('pending_changes_at'),
		reviewRequestedAt: timestamp('review_requested_at'),
		lastReviewedAt: timestamp('last_reviewed_at'),
		derivedCount: integer('derived_count').default(0).notNull(),
		/** Step text and parts values, kept up to date by the app for full-text search. */
		searchText: text('search_text').default('').notNull(),
		/**
		 * What full-text search matches: title (weight A), summary (B) and the search text (C). Kept by a
		 * database trigger (migration 0016, starground_build_search_vector) that recomputes it only when
		 * title, summary or search text change — a write that touches the row for other reasons (the reader
		 * version, review times, counts) does not re-parse up to 200,000 characters.
		 */
		search: tsvector('search'),
		/**
		 * What the relevance order ranks by: title (A) and summary (B) only — small, so ranking it is cheap
		 * (search.ts searchDistance, builds/list.ts relevancePage). Recomputed on every write, which costs
		 * little at this size.
		 */
		searchHead: tsvector('search_head')
			.notNull()
			.generatedAlwaysAs(
				(): SQL =>
					sql`setweight(to_tsvector('english', coalesce(${build.title}, '')), 'A') || setweight(to_tsvector('english', coalesce(${build.summary}, '')), 'B')`
			),
		publishedAt: timestamp('published_at'),
		createdAt: timestamp('created_at').defaultNow().notNull(),
		updatedAt: timestamp('updated_at').defaultNow().notNull(),
		/**
		 * What a reader of the build page sees, versioned: database triggers (migration 0004) bump it on
		 * every write to the build row or to a row the page shows (steps, photos, spec blocks, parts,
		 * revisions, reviews, hazard tags, comments, lineage, names). The reader cache keys on it.
		 */
		viewVersion: integer('view_version').default(0).notNull(),
		/** When viewVersion last moved (Last-Modified of the reader's page). */
		viewChangedAt: timestamp('view_changed_at', { precision: 3 }).defaultNow().notNull()
	},
	(t) => [
		index('build_owner_idx').on(t.ownerId),
		index('build_status_published_idx').on(t.status, t.publishedAt, t.id),
		index('build_derived_from_idx').on(t.derivedFromId),
		index('build_search_idx').using('gin', t.search),
		// Relevance order inside the index (RUM extension, Debian postgresql-15-rum), over the small title and
		// summary vector: see search.ts searchDistance.
		index('build_search_head_rum_idx').using('rum', t.searchHead.op('rum_tsvector_ops')),
		// Keyset pagination of the "most started from" (`most-derived`) and "recently reviewed" orders (builds/list.ts sortSpec).
		index('build_published_derived_idx')
			.on(t.derivedCount.desc(), t.publishedAt.desc(), t.id.desc())
			.where(sql`${t.status} = 'published'`),
		index('build_published_reviewed_idx')
			.on(sql`(coalesce(${t.lastReviewedAt}, '-infinity'::timestamp)) desc`, t.publishedAt.desc(), t.id.desc())
			.where(sql`${t.status} = 'published'`),
		check('build_status_check', sql`${t.status} in ('draft','published','archived')`)
	]
);

export const buildStep = pgTable(
	'build_step',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		position: integer('position').notNull(),
		title: text('title').notNull(),
		bodyMd: text('body_md').default('').notNull(),
		bodyHtml: text('body_html').default('').notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull(),
		updatedAt: timestamp('updated_at').defaultNow().notNull()
	},
	(t) => [index('build_step_build_idx').on(t.buildId, t.position)]
);

/** A processed photo: WebP renditions under `keyPrefix` in object storage. */
export const photo = pgTable(
	'photo',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		ownerId: text('owner_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		buildId: uuid('build_id').references(() => build.id, { onDelete: 'cascade' }),
		stepId: uuid('step_id').references(() => buildStep.id, { onDelete: 'cascade' }),
		keyPrefix: text('key_prefix').notNull(),
		widths: jsonb('widths').$type<number[]>().notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		alt: text('alt').notNull(),
		placeholder: text('placeholder'),
		position: integer('position').default(0).notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [index('photo_build_idx').on(t.buildId), index('photo_step_idx').on(t.stepId)]
);

/**
 * A file attached to a build (schematic, PCB and fabrication files, enclosure drawing): one object at `key` in
 * object storage, checked by its content ($lib/server/attachments). Served only as a download.
 */
export const buildAttachment = pgTable(
	'build_attachment',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		ownerId: text('owner_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		/** What it is: schematic, pcb, enclosure, other ($lib/attachments ATTACHMENT_KINDS). */
		kind: text('kind').notNull(),
		/** The file name shown and offered on download (made safe, extension matching the content). */
		name: text('name').notNull(),
		/** The type found in the file's content: pdf, png, jpg, zip. */
		ext: text('ext').notNull(),
		mime: text('mime').notNull(),
		sizeBytes: integer('size_bytes').notNull(),
		key: text('key').notNull(),
		position: integer('position').default(0).notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [index('build_attachment_build_idx').on(t.buildId, t.position)]
);

export const specBlock = pgTable(
	'spec_block',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		kind: text('kind').notNull(),
		title: text('title').default('').notNull(),
		data: jsonb('data').$type<Record<string, unknown>>().notNull(),
		derived: jsonb('derived').$type<Record<string, unknown>>().notNull(),
		checks: jsonb('checks').$type<StoredCheck[]>().notNull(),
		position: integer('position').default(0).notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull(),
		updatedAt: timestamp('updated_at').defaultNow().notNull()
	},
	(t) => [index('spec_block_build_idx').on(t.buildId)]
);

export interface StoredCheck {
	id: string;
	level: 'note' | 'caution' | 'danger';
	message: string;
	values: Record<string, unknown>;
	caution?: string;
}

export const partLine = pgTable(
	'part_line',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		position: integer('position').notNull(),
		designators: text('designators').default('').notNull(),
		quantity: integer('quantity').default(1).notNull(),
		kind: text('kind').notNull(),
		valueText: text('value_text').default('').notNull(),
		value: doublePrecision('value'),
		unit: text('unit'),
		tolerancePct: doublePrecision('tolerance_pct'),
		ratingV: doublePrecision('rating_v'),
		ratingW: doublePrecision('rating_w'),
		package: text('package').default('').notNull(),
		notes: text('notes').default('').notNull(),
		designValueText: text('design_value_text'),
		designValue: doublePrecision('design_value'),
		substitutionReason: text('substitution_reason'),
		deviationPct: doublePrecision('deviation_pct'),
		checks: jsonb('checks').$type<StoredCheck[]>().default([]).notNull(),
		// Costed parts list and AC ratings (issue 13; $lib/parts/cost.ts). Money is exact: numeric, never a float.
		ratingVAc: boolean('rating_v_ac').default(false).notNull(),
		mpn: text('mpn').default('').notNull(),
		supplier: text('supplier').default('').notNull(),
		unitPrice: numeric('unit_price', { precision: 14, scale: 4 }),
		currency: text('currency'),
		perChannel: boolean('per_channel').default(false).notNull()
	},
	(t) => [
		index('part_line_build_idx').on(t.buildId, t.position),
		check('part_line_price_check', sql`${t.unitPrice} is null or (${t.unitPrice} >= 0 and ${t.currency} ~ '^[A-Z]{3}$')`)
	]
);

/** Snapshot of a published build at each revision the maker publishes: Rev A, Rev B, … with the maker's change note. */
export const buildRevision = pgTable(
	'build_revision',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		number: integer('number').notNull(),
		authorId: text('author_id').references(() => user.id, { onDelete: 'set null' }),
		summary: text('summary').notNull(),
		/** The maker's short "what changed" note ('' when none was given). */
		note: text('note').default('').notNull(),
		snapshot: jsonb('snapshot').$type<Record<string, unknown>>().notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [uniqueIndex('build_revision_number_idx').on(t.buildId, t.number)]
);

export const review = pgTable(
	'review',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		reviewerId: text('reviewer_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		revision: integer('revision').notNull(),
		verdict: text('verdict').notNull(),
		summaryMd: text('summary_md').notNull(),
		summaryHtml: text('summary_html').notNull(),
		/** Mains review checklist (reviews/checklist.ts): each item's key and whether the reviewer ticked it; [] when not a mains build. */
		checklist: jsonb('checklist').$type<{ key: string; ticked: boolean }[]>().default([]).notNull(),
		/** Why the reviewer signed off with items unticked ('' when all were ticked or none applied). */
		checklistNote: text('checklist_note').default('').notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [
		index('review_build_idx').on(t.buildId, t.createdAt),
		index('review_reviewer_idx').on(t.reviewerId),
		check('review_verdict_check', sql`${t.verdict} in ('safe','rework')`)
	]
);

export const safetyFlag = pgTable(
	'safety_flag',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		raisedById: text('raised_by_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		targetKind: text('target_kind').notNull(),
		targetId: uuid('target_id').notNull(),
		category: text('category').notNull(),
		severity: text('severity').notNull(),
		noteMd: text('note_md').notNull(),
		noteHtml: text('note_html').notNull(),
		state: text('state').default('open').notNull(),
		revision: integer('revision').notNull(),
		addressedNote: text('addressed_note'),
		addressedAt: timestamp('addressed_at'),
		resolvedById: text('resolved_by_id').references(() => user.id, { onDelete: 'set null' }),
		resolvedAt: timestamp('resolved_at'),
		/** The reviewer's note when clearing the tag ('' when none). */
		resolvedNote: text('resolved_note').default('').notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull(),
		updatedAt: timestamp('updated_at').defaultNow().notNull()
	},
	(t) => [
		index('safety_flag_build_idx').on(t.buildId, t.state),
		check('safety_flag_state_check', sql`${t.state} in ('open','addressed','resolved')`)
	]
);

// ── Review desk (issue 14, reviews/desk.ts) ─────────────────────────────────────────────────────────
/**
 * One row per build waiting on the review desk, kept by database triggers (migrations 0007, 0014): it appears
 * when build.review_requested_at is set and goes when it is cleared; mains/category and the DANGER/CAUTION
 * counts follow the PUBLISHED revision's snapshot (what a review is of; live rows for a build without one). Filters and sorts of the desk read only
 * this table, through the indexes below. The maker's note and a reviewer's claim live here too.
 */
export const reviewRequest = pgTable(
	'review_request',
	{
		buildId: uuid('build_id')
			.primaryKey()
			.references(() => build.id, { onDelete: 'cascade' }),
		requestedAt: timestamp('requested_at').notNull(),
		mainsPowered: boolean('mains_powered').notNull(),
		category: text('category').notNull(),
		dangerChecks: integer('danger_checks').default(0).notNull(),
		cautionChecks: integer('caution_checks').default(0).notNull(),
		/** True when the build had a verdict before this request (a re-review). */
		rereview: boolean('rereview').default(false).notNull(),
		/** The maker's note for the reviewer ('' when none). */
		note: text('note').default('').notNull(),
		claimedById: text('claimed_by_id').references(() => user.id, { onDelete: 'set null' }),
		claimedAt: timestamp('claimed_at')
	},
	(t) => [
		index('review_request_oldest_idx').on(t.requestedAt, t.buildId),
		index('review_request_danger_idx').on(t.dangerChecks.desc(), t.requestedAt, t.buildId),
		index('review_request_mains_idx').on(t.requestedAt, t.buildId).where(sql`${t.mainsPowered}`),
		index('review_request_mains_danger_idx')
			.on(t.dangerChecks.desc(), t.requestedAt, t.buildId)
			.where(sql`${t.mainsPowered} and ${t.dangerChecks} > 0`),
		index('review_request_category_idx').on(t.category, t.requestedAt, t.buildId)
	]
);

/** A reviewer's desk mail settings: the categories they follow and when their last digest went out. */
export const reviewerSetting = pgTable(
	'reviewer_setting',
	{
		userId: text('user_id')
			.primaryKey()
			.references(() => user.id, { onDelete: 'cascade' }),
		categories: text('categories').array().default(sql`'{}'::text[]`).notNull(),
		digestSentAt: timestamp('digest_sent_at')
	},
	(t) => [index('reviewer_setting_categories_idx').using('gin', t.categories)]
);

/** A message in a hazard tag's thread (maker ↔ reviewer). */
export const flagMessage = pgTable(
	'flag_message',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		flagId: uuid('flag_id')
			.notNull()
			.references(() => safetyFlag.id, { onDelete: 'cascade' }),
		authorId: text('author_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		bodyMd: text('body_md').notNull(),
		bodyHtml: text('body_html').notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [index('flag_message_flag_idx').on(t.flagId, t.createdAt)]
);

export const comment = pgTable(
	'comment',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		authorId: text('author_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		parentId: uuid('parent_id').references((): AnyPgColumn => comment.id, { onDelete: 'cascade' }),
		bodyMd: text('body_md').notNull(),
		bodyHtml: text('body_html').notNull(),
		hidden: boolean('hidden').default(false).notNull(),
		hiddenReason: text('hidden_reason'),
		deletedAt: timestamp('deleted_at'),
		editedAt: timestamp('edited_at'),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [index('comment_build_idx').on(t.buildId, t.createdAt), index('comment_parent_idx').on(t.parentId)]
);

export const report = pgTable(
	'report',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		reporterId: text('reporter_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		targetKind: text('target_kind').notNull(),
		targetId: text('target_id').notNull(),
		reason: text('reason').notNull(),
		state: text('state').default('open').notNull(),
		handledById: text('handled_by_id').references(() => user.id, { onDelete: 'set null' }),
		handledAt: timestamp('handled_at'),
		resolution: text('resolution'),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [index('report_state_idx').on(t.state, t.createdAt)]
);

/** Every moderator and admin action: who, what, target, reason, when. */
export const auditEntry = pgTable(
	'audit_entry',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		actorId: text('actor_id').references(() => user.id, { onDelete: 'set null' }),
		action: text('action').notNull(),
		targetKind: text('target_kind').notNull(),
		targetId: text('target_id').notNull(),
		reason: text('reason').default('').notNull(),
		details: jsonb('details').$type<Record<string, unknown>>().default({}).notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [index('audit_entry_created_idx').on(t.createdAt), index('audit_entry_action_idx').on(t.action)]
);

/** A member's saved builds. */
export const benchItem = pgTable(
	'bench_item',
	{
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		/** The member's own note on the saved build (what to order, what to change); only they see it. */
		note: text('note').default('').notNull(),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [primaryKey({ columns: [t.userId, t.buildId] })]
);

/** Counters of the API write rate limiter (rate-limiter-flexible's Drizzle store), shared by every app process. */
export const apiRateLimit = pgTable('api_rate_limit', {
	key: text('key').primaryKey(),
	points: integer('points').default(0).notNull(),
	expire: timestamp('expire', { withTimezone: true })
});

/**
 * Which version of the check rules the stored check results were last brought up to (specs-recheck.ts): one row per
 * kind of stored result (`name` 'spec-checks'). At start the app walks the builds only when its CHECK_RULES_VERSION differs.
 */
export const checkRulesApplied = pgTable('check_rules_applied', {
	name: text('name').primaryKey(),
	version: integer('version').notNull(),
	appliedAt: timestamp('applied_at', { withTimezone: true }).defaultNow().notNull()
});

/**
 * `Idempotency-Key` of API writes (http/idempotency.ts): per member or client address, the first
 * answer to a request, replayed when the same request comes again. Rows older than 24 hours are removed.
 */
export const idempotencyKey = pgTable(
	'idempotency_key',
	{
		scope: text('scope').notNull(),
		key: text('key').notNull(),
		fingerprint: text('fingerprint').notNull(),
		status: integer('status'),
		contentType: text('content_type'),
		body: text('body'),
		createdAt: timestamp('created_at', { withTimezone: true }).defaultNow().notNull(),
		/** Set inside the transaction of the request's write (db/tx.ts inTx): from then on the request is never repeated. */
		writtenAt: timestamp('written_at', { withTimezone: true })
	},
	(t) => [primaryKey({ columns: [t.scope, t.key] }), index('idempotency_key_created_idx').on(t.createdAt)]
);

/**
 * Find by numbers (builds/find-index.ts): the figures of each published build's LATEST REVISION, one row per
 * amplifier or supply spec block, rewritten in the transaction that records the revision. Rails are per side
 * (a single supply counts as half its total each side).
 */
export const publishedFigure = pgTable(
	'published_figure',
	{
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		/** Position of the block in the revision's spec blocks. */
		block: integer('block').notNull(),
		kind: text('kind').notNull(),
		railV: doublePrecision('rail_v'),
		loadOhm: doublePrecision('load_ohm'),
		powerW: doublePrecision('power_w')
	},
	(t) => [
		primaryKey({ columns: [t.buildId, t.block] }),
		index('published_figure_rail_idx').on(t.railV, t.buildId),
		index('published_figure_load_idx').on(t.loadOhm, t.buildId),
		index('published_figure_power_idx').on(t.powerW, t.buildId)
	]
);

/** "Builds using this part": the parts lines of each published build's latest revision, values normalised. */
export const publishedPart = pgTable(
	'published_part',
	{
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		line: integer('line').notNull(),
		kind: text('kind').notNull(),
		/** SI value (Ω, F, H) for resistors, capacitors, inductors, pots; null otherwise. */
		value: doublePrecision('value'),
		/** The value as typed, lower case, spaces squeezed: matches kinds without an SI value ("to-220 npn"). */
		valueKey: text('value_key').notNull(),
		/** The package, lower case, spaces squeezed ('' when none). */
		packageKey: text('package_key').notNull()
	},
	(t) => [
		primaryKey({ columns: [t.buildId, t.line] }),
		index('published_part_value_idx').on(t.kind, t.value, t.buildId),
		index('published_part_text_idx').on(t.kind, t.valueKey, t.buildId),
		index('published_part_package_idx').on(t.packageKey, t.buildId)
	]
);

/**
 * "I built this too" (server/built-it.ts): a member's record that they built a published build, or their own
 * build based on it, with the figures they measured as checked blocks (bring-up, measurements) and a photo.
 * One per member and build.
 */
export const buildReport = pgTable(
	'build_report',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		/** The member's own published build based on this one, when they made one. */
		basedOnId: uuid('based_on_id').references(() => build.id, { onDelete: 'set null' }),
		note: text('note').default('').notNull(),
		/** Checked blocks: { kind, data, derived, checks }[] (kinds bringup, measurements). */
		blocks: jsonb('blocks').$type<{ kind: string; data: Record<string, unknown>; derived: Record<string, unknown>; checks: StoredCheck[] }[]>().default([]).notNull(),
		photoId: uuid('photo_id').references(() => photo.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at').defaultNow().notNull(),
		updatedAt: timestamp('updated_at').defaultNow().notNull()
	},
	(t) => [uniqueIndex('build_report_member_idx').on(t.buildId, t.userId), index('build_report_user_idx').on(t.userId)]
);

/**
 * What anonymous readers see of the lists (home, browse, search, the API list) as one number: database
 * triggers (migration 0012) move it once per transaction that inserts, changes or deletes a build that is
 * not a draft — and every change a list shows touches its build row (migration 0004's triggers). The list
 * caches (server/builds/list-cache.ts) key on it. One row.
 */
export const readerVersion = pgTable(
	'reader_version',
	{
		id: integer('id').primaryKey().default(1),
		version: bigint('version', { mode: 'number' }).default(0).notNull(),
		changedAt: timestamp('changed_at', { precision: 3 }).defaultNow().notNull()
	},
	(t) => [check('reader_version_one_row', sql`${t.id} = 1`)]
);

/**
 * Watching a build (server/watching): the member gets mail about its new comments, revisions and review state
 * changes, like its maker. Member-only state: no build page reader sees it, so the reader cache ignores it.
 */
export const buildWatch = pgTable(
	'build_watch',
	{
		buildId: uuid('build_id')
			.notNull()
			.references(() => build.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		createdAt: timestamp('created_at').defaultNow().notNull()
	},
	(t) => [primaryKey({ columns: [t.buildId, t.userId] }), index('build_watch_user_idx').on(t.userId)]
);

export type Build = typeof build.$inferSelect;
export type BuildStep = typeof buildStep.$inferSelect;
export type Photo = typeof photo.$inferSelect;
export type BuildAttachment = typeof buildAttachment.$inferSelect;
export type SpecBlock = typeof specBlock.$inferSelect;
export type PartLine = typeof partLine.$inferSelect;
export type BuildRevision = typeof buildRevision.$inferSelect;
export type Review = typeof review.$inferSelect;
export type SafetyFlag = typeof safetyFlag.$inferSelect;
export type Comment = typeof comment.$inferSelect;
export type ReviewRequest = typeof reviewRequest.$inferSelect;
export type FlagMessage = typeof flagMessage.$inferSelect;
export type Report = typeof report.$inferSelect;
export type AuditEntry = typeof auditEntry.$inferSelect;
export type User = typeof user.$inferSelect;
