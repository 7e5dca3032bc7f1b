import { error } from '@sveltejs/kit';
import { diffRevisions, getRevision, listRevisions, requireVisibleBuild } from '$lib/server/builds';
import { actorOf } from '$lib/server/actor';
import type { PageServerLoad } from './$types';

const revNumber = (v: string | null) => (v && /^[1-9]\d{0,6}$/.test(v) ? Number(v) : null);

/** The differences between two revisions of a build (`?from=1&to=3`; default: the latest against the one before). */
export const load: PageServerLoad = async ({ params, locals, url }) => {
	const b = await requireVisibleBuild(params.slug, actorOf(locals.user));
	const revisions = await listRevisions(b.id);
	if (revisions.length === 0) error(404, 'This build has no revisions yet.');
	const latest = revisions[0].number;
	let to = revNumber(url.searchParams.get('to')) ?? latest;
	let from = revNumber(url.searchParams.get('from')) ?? Math.max(1, to - 1);
	if (from > to) [from, to] = [to, from];
	const [a, z] = await Promise.all([getRevision(b.id, from), getRevision(b.id, to)]);
	if (!a || !z) error(404, 'There is no such revision of this build.');
	return {
		build: { slug: b.slug, title: b.title, revision: b.revision },
		revisions: revisions.map((r) => ({ number: r.number })),
		from: { number: a.number, note: a.note, summary: a.summary, createdAt: a.createdAt },
		to: { number: z.number, note: z.note, summary: z.summary, createdAt: z.createdAt },
		diff: diffRevisions(a.snapshot, z.snapshot)
	};
};
