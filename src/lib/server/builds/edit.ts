/** Creating, changing, publishing, archiving and locking builds. Every write checks who is acting. */
import { error } from '@sveltejs/kit';
import { count, eq, like, or } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';
import { buildSchema, progressSchema, type BuildInput, type BuildProgress } from '$lib/schemas/build';
import { allowedLicencesFor } from '$lib/licences';
import { LICENCE_LABELS, labelOf } from '$lib/labels';
import type { Actor } from '../actor';
import { assertCanEdit } from './access';
import { nextFreeSlug, slugify } from './slug';
import { createRevision, markPendingChanges, REVISION_NOTE_MAX } from './revisions';
import { refreshSearchText } from '../search';
import { inTx, pgCode } from '../db/tx';

/** Load a build by id for a change, locking its row until the transaction ends; 404 when absent. */
export async function lockBuild(tx: Tx, buildId: string): Promise<schema.Build> {
	const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
	if (!b) error(404, 'Not found');
	return b;
}

/** The first free slug for a title, given what is in the table now. */
async function freeSlug(tx: Tx, title: string, exceptId?: string): Promise<string> {
	const base = slugify(title);
	const rows = await tx
		.select({ slug: schema.build.slug, id: schema.build.id })
		.from(schema.build)
		.where(or(eq(schema.build.slug, base), like(schema.build.slug, `${base}-%`)));
	return nextFreeSlug(
		base,
		rows.filter((r) => r.id !== exceptId).map((r) => r.slug)
	);
}

/**
 * Write a row with a fresh slug; on a unique-slug clash with a concurrent writer, take the next one.
 * Runs each attempt in a savepoint so a clash does not abort the caller's transaction.
 */
export async function withFreeSlug<T>(tx: Tx, title: string, write: (tx: Tx, slug: string) => Promise<T>, exceptId?: string): Promise<T> {
	for (let attempt = 0; ; attempt++) {
		let slug = await freeSlug(tx, title, exceptId);
		if (attempt > 0) slug = `${slug}-${crypto.randomUUID().slice(0, 4)}`;
		try {
			return await tx.transaction((sp) => write(sp, slug));
		} catch (e) {
			if (pgCode(e) !== '23505' || attempt >= 4) throw e;
		}
	}
}

/**
 * Create a draft build owned by `ownerId` with a unique readable slug from its title (a suffix on a
 * clash: "chip-amp-2"). Input is validated with buildSchema (throws ZodError on bad input).
 * Works inside the caller's transaction (`tx`) or its own. → { id, slug }
 */
export async function createDraft(
	ownerId: string,
	input: BuildInput,
	tx?: Tx,
	extra: { derivedFromId?: string } = {}
): Promise<{ id: string; slug: string }> {
	const data = buildSchema.parse(input);
	return inTx(tx, (t) =>
		withFreeSlug(t, data.title, async (sp, slug) => {
			const [row] = await sp
				.insert(schema.build)
				.values({ ...data, slug, ownerId, status: 'draft', derivedFromId: extra.derivedFromId ?? null })
				.returning({ id: schema.build.id, slug: schema.build.slug });
			return row;
		})
	);
}

/**
 * Change a build's fields (owner or admin; not while locked). While a build has never been
 * published its slug follows its title; after that the URL stays put. On a published build the
 * change joins its pending changes (markPendingChanges). → { slug, revision } (revision always null now)
 */
export async function updateBuild(
	actor: Actor,
	buildId: string,
	input: BuildInput,
	tx?: Tx
): Promise<{ slug: string; revision: number | null }> {
	const data = buildSchema.parse(input);
	return inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		await assertLicenceAllowed(t, b, data.licence);
		let slug = b.slug;
		const write = async (w: Tx, newSlug: string) => {
			await w
				.update(schema.build)
				.set({ ...data, slug: newSlug, updatedAt: new Date() })
				.where(eq(schema.build.id, buildId));
			return newSlug;
		};
		if (b.status === 'draft' && !b.publishedAt && slugify(data.title) !== slugify(b.title)) {
			slug = await withFreeSlug(t, data.title, write, buildId);
		} else {
			await write(t, b.slug);
		}
		await markPendingChanges(t, buildId);
		return { slug, revision: null };
	});
}

/**
 * A build based on another follows the origin's licence terms: under a share-alike licence it keeps that
 * licence (see $lib/licences). 422 with a sentence otherwise; a build without an origin may take any.
 */
async function assertLicenceAllowed(t: Tx, b: schema.Build, licence: string): Promise<void> {
	if (!b.derivedFromId || licence === b.licence) return;
	const [origin] = await t.select({ licence: schema.build.licence, title: schema.build.title }).from(schema.build).where(eq(schema.build.id, b.derivedFromId));
	if (!origin) return;
	const allowed = allowedLicencesFor(origin.licence);
	if (!allowed.includes(licence as (typeof allowed)[number])) {
		error(
			422,
			`This build is based on “${origin.title}”, shared under ${labelOf(LICENCE_LABELS, origin.licence)}: a build based on it keeps that licence (share alike).`
		);
	}
}

/**
 * Publish a draft, or publish again an archived build (owner or admin). Needs at least one step.
 * The first publication is Rev A; publishing again after archiving records a revision only if the
 * content changed meanwhile. `note` is the optional change note of that revision. → the revision number now current.
 */
export async function publish(actor: Actor, buildId: string, tx?: Tx, note = ''): Promise<number> {
	if (note.length > REVISION_NOTE_MAX) error(422, `Keep the note under ${REVISION_NOTE_MAX} characters.`);
	return inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		if (b.status === 'published') error(409, 'This build is already published.');
		const [{ n }] = await t.select({ n: count() }).from(schema.buildStep).where(eq(schema.buildStep.buildId, buildId));
		if (n === 0) error(422, 'Add at least one step before publishing: readers need to know how it was built.');
		const now = new Date();
		await t
			.update(schema.build)
			.set({ status: 'published', publishedAt: b.publishedAt ?? now, updatedAt: now })
			.where(eq(schema.build.id, buildId));
		await refreshSearchText(t, buildId);
		const rev = await createRevision(t, buildId, actor.id, note);
		return rev?.number ?? b.revision;
	});
}

/**
 * Set the maker's build status (in progress / working / abandoned) of a draft, published or archived build
 * (owner or admin; not while locked). It says how the build is going, not what it is: it takes effect at
 * once and is not part of a revision. Bad values → 422 with a sentence. → the status now stored.
 */
export async function setBuildProgress(actor: Actor, buildId: string, progress: unknown, tx?: Tx): Promise<BuildProgress> {
	const parsed = progressSchema.safeParse({ progress });
	if (!parsed.success) error(422, 'Choose a build status: in progress, working or abandoned.');
	return inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		if (b.progress !== parsed.data.progress) {
			await t.update(schema.build).set({ progress: parsed.data.progress, updatedAt: new Date() }).where(eq(schema.build.id, buildId));
		}
		return parsed.data.progress;
	});
}

/** Archive a published build (owner or admin): it leaves lists and feeds but stays readable at its URL. */
export async function archive(actor: Actor, buildId: string, tx?: Tx): Promise<void> {
	await inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		if (b.status !== 'published') error(409, 'Only a published build can be archived.');
		await t.update(schema.build).set({ status: 'archived', updatedAt: new Date() }).where(eq(schema.build.id, buildId));
	});
}
