/**
 * Rate limiting of API writes (comments, reports, bench, …) with rate-limiter-flexible.
 * Counters live in PostgreSQL (`api_rate_limit`, one atomic upsert per hit), so every app process
 * behind a load balancer shares them; an in-memory limiter stands in while the database is unreachable.
 */
import { RateLimiterDrizzle, RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible';
import { env } from '$env/dynamic/private';
import { db } from './db';
import { apiRateLimit } from './db/schema';
import { apiError } from './http';

/** Default budget: this many writes per member (or per address when signed out) per window. */
export const WRITE_POINTS_DEFAULT = 60;
/** Window length in seconds. */
export const WRITE_WINDOW_S = 60;

export interface LimiterOptions {
	/** Writes allowed per window. */
	points: number;
	/** Window length in seconds. */
	durationS: number;
	/** Separates counters of different limiters in the shared table. */
	keyPrefix: string;
}

export type Verdict = { ok: true; remaining: number } | { ok: false; retryAfterS: number };

/** A limiter over the shared table; `consume(key)` says whether one more write fits. */
export function createLimiter(opts: LimiterOptions) {
	const store = new RateLimiterDrizzle({
		storeClient: db,
		schema: apiRateLimit,
		points: opts.points,
		duration: opts.durationS,
		keyPrefix: opts.keyPrefix,
		insuranceLimiter: new RateLimiterMemory({ points: opts.points, duration: opts.durationS, keyPrefix: opts.keyPrefix })
	});
	return {
		/** Count one write for `key`. Never throws for a full budget: answers { ok: false, retryAfterS }. */
		async consume(key: string, points = 1): Promise<Verdict> {
			try {
				const res = await store.consume(key, points);
				return { ok: true, remaining: res.remainingPoints };
			} catch (e) {
				if (e instanceof RateLimiterRes) return { ok: false, retryAfterS: Math.max(1, Math.ceil(e.msBeforeNext / 1000)) };
				throw e;
			}
		},
		/** Seconds until `key` may act again when its budget is used up; 0 when it still has room. Counts nothing. */
		async blockedFor(key: string): Promise<number> {
			const res = await store.get(key);
			if (!res || res.consumedPoints < opts.points) return 0;
			return Math.max(1, Math.ceil(res.msBeforeNext / 1000));
		},
		/** Forget the counter of `key` (tests, and an admin lifting a limit). */
		reset: (key: string) => store.delete(key)
	};
}

let writes: ReturnType<typeof createLimiter> | null = null;

/** Writes per window from env `API_WRITE_LIMIT` (a positive number, or `off`), else 60. */
export function writeBudget(): number | 'off' {
	const v = env.API_WRITE_LIMIT;
	if (v === 'off') return 'off';
	const n = Number(v);
	return Number.isFinite(n) && n >= 1 ? Math.floor(n) : WRITE_POINTS_DEFAULT;
}

/**
 * Count one API write for the member (`user:<id>`) or, signed out, the client address (`ip:<addr>`).
 * Always ok when limiting is switched off.
 */
export async function consumeWrite(who: { userId?: string | null; address: string }): Promise<Verdict> {
	const budget = writeBudget();
	if (budget === 'off') return { ok: true, remaining: Infinity };
	writes ??= createLimiter({ points: budget, durationS: WRITE_WINDOW_S, keyPrefix: 'api-write' });
	return writes.consume(who.userId ? `user:${who.userId}` : `ip:${who.address}`);
}

let uploads: ReturnType<typeof createLimiter> | null = null;

/** Uploads (photos, avatars) per member per hour from env `UPLOAD_LIMIT` (a positive number, or `off`), else 120. */
export function uploadBudget(): number | 'off' {
	const v = env.UPLOAD_LIMIT;
	if (v === 'off') return 'off';
	const n = Number(v);
	return Number.isFinite(n) && n >= 1 ? Math.floor(n) : 120;
}

/** Count one upload of a member against their hourly budget. */
export async function consumeUpload(userId: string): Promise<Verdict> {
	const budget = uploadBudget();
	if (budget === 'off') return { ok: true, remaining: Infinity };
	uploads ??= createLimiter({ points: budget, durationS: 60 * 60, keyPrefix: 'upload' });
	return uploads.consume(`user:${userId}`);
}

/** "You have uploaded a lot …" sentence for a refused upload. */
export function uploadLimitSentence(retryAfterS: number): string {
	const m = Math.max(1, Math.ceil(retryAfterS / 60));
	return `You have uploaded the most pictures we take in an hour. Try again in ${m} minute${m === 1 ? '' : 's'}.`;
}

/** 429 `rate_limited` in the API envelope, with `Retry-After` in seconds. */
export function rateLimitedResponse(retryAfterS: number): Response {
	return apiError(
		429,
		'rate_limited',
		`Too many changes in a short time. Try again in ${retryAfterS} second${retryAfterS === 1 ? '' : 's'}.`,
		[],
		{ 'Retry-After': String(retryAfterS) }
	);
}

const WRITE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * Whether a request is an API write that counts against the budget: a POST/PUT/PATCH/DELETE under
 * /api/v1, except the pure computations (bench tools, spec check), which store nothing.
 */
export function isLimitedWrite(method: string, pathname: string): boolean {
	if (!WRITE_METHODS.has(method.toUpperCase())) return false;
	if (!pathname.startsWith('/api/v1/')) return false;
	return !(pathname.startsWith('/api/v1/tools/') || pathname === '/api/v1/spec-check' || pathname === '/api/v1/ping');
}
