// Code the build page needs only for some builds, loaded here (on the server for the first render, in the
// browser before it hydrates) so that readers of other builds never download it: the costing (decimal.js)
// only for a parts list with prices.
import { hasPrices } from '$lib/components/parts/money';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ data }) => {
	const money = hasPrices(data.parts) ? await import('$lib/parts/cost') : null;
	return { ...data, money };
};
