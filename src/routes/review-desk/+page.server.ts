import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import {
	claimHours,
	claimRequest,
	deskQueryString,
	digestMinutes,
	followedCategories,
	listDesk,
	listRecentlyReviewed,
	parseDeskQuery,
	releaseClaim,
	setFollowedCategories
} from '$lib/server/reviews';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';
import { withOutcome } from '$lib/outcomes';
import type { Action, Actions, PageServerLoad } from './$types';

/** The review desk: waiting builds in pages (filters, order, claims), the latest verdicts, the reviewer's desk mail. Reviewers and up. */
export const load: PageServerLoad = async ({ url, request }) => {
	const user = requireRole('reviewer');
	const query = parseDeskQuery(url.searchParams);
	const after = url.searchParams.get('after');
	// One address per desk view: the filter form also sends its defaults and empty fields; drop them.
	const done = url.searchParams.get('done');
	const canonical = deskQueryString(query, after) + (done ? `${deskQueryString(query, after) ? '&' : '?'}done=${encodeURIComponent(done)}` : '');
	if (request.method === 'GET' && url.search !== canonical) redirect(302, `/review-desk${canonical}`);
	const [page, recent, following] = await Promise.all([
		listDesk(query, after),
		after ? Promise.resolve([]) : listRecentlyReviewed(),
		followedCategories(user.id)
	]);
	return {
		query,
		paged: !!after,
		nextHref: page.next ? `/review-desk${deskQueryString(query, page.next)}` : null,
		firstHref: `/review-desk${deskQueryString(query)}`,
		total: page.total,
		waiting: page.items.map((w) => ({ ...w, own: w.maker.id === user.id, mine: w.claim?.byId === user.id })),
		recent,
		following,
		claimHours: claimHours(),
		digestMinutes: digestMinutes(),
		isModerator: user.role === 'moderator' || user.role === 'admin'
	};
};

/** Back to the desk page the form was on (its query string), with what happened. */
function backTo(form: FormData, code: Parameters<typeof withOutcome>[1], anchor = '') {
	const q = String(form.get('query') ?? '');
	const safe = q.startsWith('?') && !/[\r\n#]/.test(q) ? q : '';
	return withOutcome(`/review-desk${safe}${anchor}`, code);
}

const buildIdOf = (form: FormData) => String(form.get('buildId') ?? '');

/** Claim or release: the domain call decides; back to the review page or the desk page it came from, saying what happened. */
const claimAction =
	(change: 'claim' | 'release'): Action =>
	async ({ request }) => {
		const user = actorOf(requireRole('reviewer'));
		const form = await request.formData();
		const id = buildIdOf(form);
		const r = await attempt(async () => (change === 'claim' ? await claimRequest(user, id) : (await releaseClaim(user, id), 'released' as const)));
		if (!r.ok) return fail(r.status, { error: r.error, buildId: id });
		if (form.get('return') === 'review' && typeof form.get('slug') === 'string') {
			redirect(303, withOutcome(`/builds/${encodeURIComponent(String(form.get('slug')))}/review`, r.value));
		}
		redirect(303, backTo(form, r.value, `#desk-${id}`));
	};

export const actions: Actions = {
	claim: claimAction('claim'),
	release: claimAction('release'),
	follow: async ({ request }) => {
		const user = actorOf(requireRole('reviewer'));
		const form = await request.formData();
		await setFollowedCategories(user, form.getAll('category').map(String));
		redirect(303, backTo(form, 'following', '#desk-mail'));
	}
};
