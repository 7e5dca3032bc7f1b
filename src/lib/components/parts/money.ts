/**
 * The costing a parts table needs ($lib/parts/cost), as a value passed in: a page that shows a list with
 * prices imports it (statically, or with `import()` only when the list has prices, as the build page's
 * +page.ts does), so decimal.js reaches the browser only where prices are shown.
 */
import type * as Cost from '$lib/parts/cost';

export type Money = Pick<typeof Cost, 'costTotals' | 'lineCost' | 'formatMoney'>;

/** Whether a list has a price anywhere (then its table needs the costing). */
export const hasPrices = (lines: readonly { unitPrice?: string | null }[]) => lines.some((l) => l.unitPrice !== null && l.unitPrice !== undefined && l.unitPrice !== '');
