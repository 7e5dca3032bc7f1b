/** Dates as the build pages show them, in UTC so server and browser render the same text. */
const day = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const dayTime = new Intl.DateTimeFormat('en-GB', {
	day: 'numeric',
	month: 'short',
	year: 'numeric',
	hour: '2-digit',
	minute: '2-digit',
	timeZone: 'UTC',
	timeZoneName: 'short'
});

/** '4 Mar 2026' (UTC). Accepts a Date or an ISO string; '' for null. */
export function formatDay(d: Date | string | null | undefined): string {
	return d ? day.format(new Date(d)) : '';
}

/** '4 Mar 2026, 14:05 UTC'. */
export function formatDayTime(d: Date | string | null | undefined): string {
	return d ? dayTime.format(new Date(d)) : '';
}

/** ISO string for a <time datetime> attribute. */
export function isoOf(d: Date | string | null | undefined): string | undefined {
	return d ? new Date(d).toISOString() : undefined;
}
