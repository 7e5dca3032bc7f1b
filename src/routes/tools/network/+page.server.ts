import { redirect } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { partsAfterEdit } from '$lib/components/tools/network-form';

// "Add a part" / "Remove part n" arrive as GET fields: answer with the list after the change.
export const load: PageServerLoad = ({ url }) => {
	const next = partsAfterEdit(url.searchParams);
	if (next) redirect(303, `${url.pathname}?${next}`);
};
