/**
 * The build's channel count and how many of a per-channel line the whole build needs (see ./cost for what a
 * per-channel line is). Apart from the costing so that a parts list without prices is shown without
 * decimal.js in the browser; $lib/parts/cost re-exports both.
 */

/** The build's channel count: the largest `channels` of its amplifier blocks (a whole number 1–64), else 1. */
export function channelsOf(blocks: readonly { kind: string; data: unknown }[]): number {
	const n = blocks
		.filter((b) => b.kind === 'amplifier')
		.map((b) => Number((b.data as Record<string, unknown> | null)?.channels))
		.filter((c) => Number.isInteger(c) && c >= 1 && c <= 64);
	return n.length ? Math.max(...n) : 1;
}

/** How many of a line the whole build needs: quantity × channels for a per-channel line, else quantity. */
export function totalQuantity(line: { quantity: number; perChannel: boolean }, channels: number): number {
	return line.perChannel ? line.quantity * channels : line.quantity;
}
