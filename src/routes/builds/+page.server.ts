import { listPage } from '$lib/server/discover';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 24;

export const load: PageServerLoad = async ({ url }) => listPage(url, PAGE_SIZE);
