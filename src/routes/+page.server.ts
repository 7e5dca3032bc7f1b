import type { PageServerLoad } from './$types';
import { cachedHomeLists } from '$lib/server/discover';

// Home only shows things: links, build cards and the header (whose menus work without JavaScript). It is
// rendered on the server and never hydrated, so it ships no framework (README "Speed", issue 15).
export const csr = false;

export const load: PageServerLoad = async () => {
	return await cachedHomeLists();
};
