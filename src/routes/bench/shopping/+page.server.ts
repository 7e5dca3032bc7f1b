import { requireUser } from '$lib/server/auth';
import { shoppingList } from '$lib/server/bench';
import type { PageServerLoad } from './$types';

/** The combined shopping list of the builds ticked on the bench (?b=slug&b=slug…). */
export const load: PageServerLoad = async ({ url }) => {
	const user = requireUser();
	const slugs = url.searchParams.getAll('b').map((s) => s.trim()).filter((s) => /^[a-z0-9][a-z0-9-]{0,199}$/.test(s));
	const list = await shoppingList(user.id, slugs);
	return { ...list, query: slugs.map((s) => `b=${encodeURIComponent(s)}`).join('&') };
};
