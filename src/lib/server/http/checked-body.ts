/**
 * The body of a write as the request guards read it (hooks/guards.ts): read once, capped, its control
 * characters removed, and handed to the route as a new Request built from that text. A JSON body is
 * parsed there too; `readJson` takes that value instead of reading and parsing the body a second time.
 */
export interface CheckedBody {
	/** The text the route receives (cleaned), or null for a body that is not text (multipart, bytes). */
	text: string | null;
	/** For JSON: the parsed, cleaned value; absent when the text is not valid JSON (the route answers 400). */
	json?: { value: unknown };
}

const kept = new WeakMap<Request, CheckedBody>();

/** Remember what the guards read for `request` (the Request the route will receive). */
export function keepCheckedBody(request: Request, body: CheckedBody): void {
	kept.set(request, body);
}

/** What the guards read for `request`, when they built it. */
export function checkedBodyOf(request: Request): CheckedBody | undefined {
	return kept.get(request);
}
