import { listPage } from '$lib/server/discover';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 20;

export const load: PageServerLoad = async ({ url }) => {
	const q = url.searchParams.get('q')?.trim() ?? '';
	if (!q) return { searched: false as const, q: '' };
	return { searched: true as const, q, ...(await listPage(url, PAGE_SIZE)) };
};
