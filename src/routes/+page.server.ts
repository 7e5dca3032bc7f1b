import type { PageServerLoad } from './$types';
import { cachedHomeLists } from '$lib/server/discover';

export const load: PageServerLoad = async () => {
	return await cachedHomeLists();
};
