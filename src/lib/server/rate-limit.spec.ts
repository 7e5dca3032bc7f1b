import { describe, expect, it } from 'vitest';
import { createLimiter, isLimitedWrite, rateLimitedResponse } from './rate-limit';

describe('API write rate limit', () => {
	it('counts in PostgreSQL: two limiters (two app processes) share one budget', async () => {
		const prefix = `test-${crypto.randomUUID()}`;
		const a = createLimiter({ points: 3, durationS: 60, keyPrefix: prefix });
		const b = createLimiter({ points: 3, durationS: 60, keyPrefix: prefix });
		expect(await a.consume('user:1')).toMatchObject({ ok: true, remaining: 2 });
		expect(await b.consume('user:1')).toMatchObject({ ok: true, remaining: 1 });
		expect(await a.consume('user:1')).toMatchObject({ ok: true, remaining: 0 });
		const refused = await b.consume('user:1');
		expect(refused.ok).toBe(false);
		if (!refused.ok) expect(refused.retryAfterS).toBeGreaterThanOrEqual(1);
		expect(refused.ok || refused.retryAfterS <= 60).toBe(true);
		// Another member has their own budget.
		expect((await a.consume('user:2')).ok).toBe(true);
		await a.reset('user:1');
		expect((await b.consume('user:1')).ok).toBe(true);
		await a.reset('user:1');
		await a.reset('user:2');
	});

	it('answers 429 rate_limited in the envelope with Retry-After', async () => {
		const res = rateLimitedResponse(12);
		expect(res.status).toBe(429);
		expect(res.headers.get('retry-after')).toBe('12');
		expect(await res.json()).toEqual({ error: { code: 'rate_limited', message: expect.stringContaining('12 seconds'), issues: [] } });
	});

	it('limits API writes, not reads or the pure computations', () => {
		expect(isLimitedWrite('POST', '/api/v1/builds/x/comments')).toBe(true);
		expect(isLimitedWrite('PATCH', '/api/v1/builds/x/comments/1')).toBe(true);
		expect(isLimitedWrite('DELETE', '/api/v1/bench/x')).toBe(true);
		expect(isLimitedWrite('POST', '/api/v1/reports')).toBe(true);
		expect(isLimitedWrite('GET', '/api/v1/builds')).toBe(false);
		expect(isLimitedWrite('POST', '/api/v1/tools/amplifier')).toBe(false);
		expect(isLimitedWrite('POST', '/api/v1/spec-check')).toBe(false);
		expect(isLimitedWrite('POST', '/builds/new')).toBe(false);
	});
});
