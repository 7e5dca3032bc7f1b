import { requireRole } from '$lib/server/auth';
import { auditFacets, listAudit } from '$lib/server/moderation';
import type { PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';

/** The audit log (admins only; moderators get 403). Filters live in the URL so a view can be shared. */
export const load: PageServerLoad = async ({ url }) => {
	const admin = actorOf(requireRole('admin'));
	const q = (k: string) => url.searchParams.get(k)?.trim().slice(0, 100) || '';
	const filter = {
		action: q('action'),
		actor: q('actor'),
		targetKind: q('kind'),
		from: q('from'),
		to: q('to'),
		page: Number(url.searchParams.get('page') ?? 1)
	};
	const [log, facets] = await Promise.all([listAudit(admin, filter), auditFacets()]);
	return { filter, ...log, facets };
};
