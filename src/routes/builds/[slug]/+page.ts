// The build page is rendered on the server and never hydrated (`csr = false`): readers and makers alike get
// HTML and CSS only, and every action on it is a plain form or link (comments, watch, bench, publish,
// archive, "start from", hazard tags, lock) — README "Speed" (issue 15). This universal load therefore runs
// on the server only; it still loads what only some builds need with `import()`, as before, and hands it to
// the page as props: the costing (decimal.js) for a parts list with prices, the line plot (d3-shape) for a
// measurements block with points to draw.
import { hasPrices } from '$lib/components/parts/money';
import { hasPlots } from '$lib/components/specs/display';
import type { PageLoad } from './$types';

export const csr = false;

export const load: PageLoad = async ({ data }) => {
	const [money, plot] = await Promise.all([
		hasPrices(data.parts) ? import('$lib/parts/cost') : null,
		hasPlots(data.specBlocks) ? import('$lib/components/plots/LinePlot.svelte').then((m) => m.default) : null
	]);
	return { ...data, money, plot };
};
