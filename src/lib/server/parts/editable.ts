/** The build an editor page works on, checked against who is asking (parts and spec-block editors). */
import { error } from '@sveltejs/kit';
import { requireUser } from '../auth';
import { assertCanEdit, getBuildBySlug, requireVisibleBuild } from '../builds';

/**
 * The build at `slug` if the signed-in member may change it: sign-in redirect when signed out, 404 when a
 * draft is not theirs to see (page loads, `forView`), 403 for another member's build or a locked one.
 */
export async function requireEditableBuild(slug: string, { forView = false } = {}) {
	const user = requireUser();
	const b = forView ? await requireVisibleBuild(slug, user) : await getBuildBySlug(slug);
	if (!b) error(404, 'Not found');
	assertCanEdit(user, b);
	return { user, build: b };
}
