import type { PageServerLoad } from './$types';
import { homeLists } from '$lib/server/discover';

export const load: PageServerLoad = async () => {
	return await homeLists();
};
