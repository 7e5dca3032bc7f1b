/**
 * The two things every editor of a build's content goes through: the guard that finds the build a member
 * may change (`requireEditableBuild`), and what follows every change (`afterContentChange`).
 */
import { error } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';
import { requireUser } from '../auth';
import { actorOf, type Actor, type Viewer } from '../actor';
import { assertCanEdit } from './access';
import { getBuildBySlug, requireVisibleBuild } from './queries';
import { markPendingChanges } from './revisions';
import { refreshSearchText } from '../search';

/**
 * The build at `slug` if the member may change it: sign-in redirect (pages) or 401 (API, JSON) when signed
 * out, 404 when there is no such build — or, for a page load (`forView`), a draft that is not theirs to
 * see — and 403 for another member's build or a locked one. `as` names the member instead of the
 * session's (tests, scripts). → { actor, build }
 */
export async function requireEditableBuild(
	slug: string,
	{ forView = false, as }: { forView?: boolean; as?: Viewer } = {}
): Promise<{ actor: Actor; build: schema.Build }> {
	const actor = as === undefined ? actorOf(requireUser()) : as;
	const build = forView ? await requireVisibleBuild(slug, actor) : await getBuildBySlug(slug);
	if (!build) error(404, 'Not found');
	assertCanEdit(actor, build);
	return { actor, build };
}

/**
 * After any change to a build's content (steps, spec blocks, parts, photos), in the change's transaction:
 * refresh the search text, bump `updatedAt`, and — on a published or archived build — join the change to
 * its pending changes, which the maker later publishes as one revision with a note (publishRevision).
 * Edits never number revisions themselves: → always null (kept so editors can report "no new revision").
 */
export async function afterContentChange(tx: Tx, buildId: string, _actor: Pick<Actor, 'id'>): Promise<number | null> {
	await refreshSearchText(tx, buildId);
	await tx.update(schema.build).set({ updatedAt: new Date() }).where(eq(schema.build.id, buildId));
	await markPendingChanges(tx, buildId);
	return null;
}
