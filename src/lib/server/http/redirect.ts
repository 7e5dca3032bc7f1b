/**
 * Where to send a member after signing in (or when a signed-in member opens the sign-in page): the
 * `next` value is resolved against our own origin the way a browser would resolve it, and only a
 * result on the same origin is kept. Backslashes, tabs, CR/LF, full-width dots and other tricks that
 * make a browser leave the site resolve to another origin (or fail to parse) and give the fallback.
 * The answer is always an ASCII path (percent-encoded), so it is safe in a Location header.
 */
export function safeNext(next: string | null | undefined, origin: string, fallback = '/'): string {
	if (!next || next.length > 2000) return fallback;
	let target: URL;
	try {
		target = new URL(next, origin);
	} catch {
		return fallback;
	}
	const own = new URL(origin);
	if (target.origin !== own.origin) return fallback;
	// Only the path a browser would request from us; the parser has percent-encoded anything unsafe.
	const path = target.pathname + target.search + target.hash;
	if (!path.startsWith('/') || path.startsWith('//') || path.startsWith('/\\')) return fallback;
	if (/[^\x21-\x7e]/.test(path)) return fallback;
	return path;
}
