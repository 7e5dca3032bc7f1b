/**
 * Control characters at the boundary: NUL (which PostgreSQL refuses in text), the other C0 controls
 * and DEL never reach a route. Text keeps tab, line feed and carriage return; single-line places
 * (query strings, keys) lose those too.
 */

// eslint-disable-next-line no-control-regex
const IN_TEXT = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g;
// eslint-disable-next-line no-control-regex
const IN_LINE = /[\u0000-\u001f\u007f]/g;

/** `s` without control characters other than tab, LF and CR. */
export function stripControls(s: string): string {
	return s.replace(IN_TEXT, '');
}

/** `s` without any control character (for one-line values such as query parameters and field names). */
export function stripLineControls(s: string): string {
	return s.replace(IN_LINE, '');
}

/** True when `s` holds a control character other than tab, LF and CR. */
export function hasControls(s: string): boolean {
	IN_TEXT.lastIndex = 0;
	const found = IN_TEXT.test(s);
	IN_TEXT.lastIndex = 0;
	return found;
}

/** A JSON value with every string (keys included) cleaned; other values unchanged. */
export function cleanJson(value: unknown, depth = 0): unknown {
	if (typeof value === 'string') return stripControls(value);
	if (depth > 64 || value === null || typeof value !== 'object') return value;
	if (Array.isArray(value)) return value.map((v) => cleanJson(v, depth + 1));
	const out: Record<string, unknown> = {};
	for (const [k, v] of Object.entries(value)) out[stripLineControls(k)] = cleanJson(v, depth + 1);
	return out;
}

/**
 * The query string with control characters removed from names and values, or null when it had none.
 * (Returned already serialized, ready for `url.search`.)
 */
export function cleanedSearch(url: URL): string | null {
	let raw: string;
	try {
		raw = decodeURIComponent(url.search.replace(/\+/g, ' '));
	} catch {
		raw = url.search;
	}
	// eslint-disable-next-line no-control-regex
	if (!/[\u0000-\u001f\u007f]/.test(raw)) return null;
	const out = new URLSearchParams();
	for (const [k, v] of url.searchParams) out.append(stripLineControls(k), stripLineControls(v));
	const s = out.toString();
	return s ? `?${s}` : '';
}

/** True when the decoded path holds a control character (no route has one: answer 404). */
export function pathHasControls(pathname: string): boolean {
	let decoded: string;
	try {
		decoded = decodeURIComponent(pathname);
	} catch {
		return true;
	}
	// eslint-disable-next-line no-control-regex
	return /[\u0000-\u001f\u007f]/.test(decoded);
}
