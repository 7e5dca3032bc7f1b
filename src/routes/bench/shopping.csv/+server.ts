import { requireUser } from '$lib/server/auth';
import { shoppingCsv, shoppingList } from '$lib/server/bench';
import type { RequestHandler } from './$types';

/** The combined shopping list as RFC 4180 CSV (?b=slug&b=slug…, builds on the member's bench). */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireUser();
	const slugs = url.searchParams.getAll('b').map((s) => s.trim()).filter((s) => /^[a-z0-9][a-z0-9-]{0,199}$/.test(s));
	const { rows } = await shoppingList(user.id, slugs);
	return new Response(shoppingCsv(rows), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="starground-shopping-list.csv"',
			'cache-control': 'private, no-store'
		}
	});
};
