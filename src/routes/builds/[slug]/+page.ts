// Code the build page needs only for some builds, loaded here (on the server for the first render, in the
// browser before it hydrates) so that readers of other builds never download it: the costing (decimal.js)
// only for a parts list with prices, the line-plot component (d3-shape) only for a measurements block with
// points to draw.
import { hasPrices } from '$lib/components/parts/money';
import { hasPlots } from '$lib/components/specs/display';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ data }) => {
	const [money, plot] = await Promise.all([
		hasPrices(data.parts) ? import('$lib/parts/cost') : null,
		hasPlots(data.specBlocks) ? import('$lib/components/plots/LinePlot.svelte').then((m) => m.default) : null
	]);
	return { ...data, money, plot };
};
