/**
 * Dates as every page shows them, in UTC and formatted by hand, so server and browser render the same text
 * whatever ICU data either has (Intl's en-GB short month for September is "Sep" in some, "Sept" in others),
 * and a list page formatting a date per card costs no formatter.
 */
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** The date, or null when there is none or it is not a date. */
function dateOf(d: Date | string | null | undefined): Date | null {
	if (!d) return null;
	const date = new Date(d);
	return Number.isNaN(date.getTime()) ? null : date;
}

const two = (n: number) => String(n).padStart(2, '0');

/** '4 Mar 2026' (UTC). Accepts a Date or an ISO string; '' for null or not a date. */
export function formatDay(d: Date | string | null | undefined): string {
	const date = dateOf(d);
	return date ? `${date.getUTCDate()} ${MONTHS[date.getUTCMonth()]} ${date.getUTCFullYear()}` : '';
}

/** '4 Mar 2026, 14:05 UTC'; '' for null or not a date. */
export function formatDayTime(d: Date | string | null | undefined): string {
	const date = dateOf(d);
	return date ? `${formatDay(date)}, ${two(date.getUTCHours())}:${two(date.getUTCMinutes())} UTC` : '';
}

/** ISO string for a <time datetime> attribute. */
export function isoOf(d: Date | string | null | undefined): string | undefined {
	return dateOf(d)?.toISOString();
}
