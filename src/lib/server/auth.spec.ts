import { describe, it, expect, vi, beforeEach } from 'vitest';
import { isHttpError, isRedirect } from '@sveltejs/kit';

// The guards read the current request through getRequestEvent(); give them one we control.
const current: { event: { locals: { user: unknown }; url: URL; request: Request } } = {
	event: { locals: { user: null }, url: new URL('http://x/builds/new'), request: new Request('http://x/builds/new') }
};
vi.mock('$app/server', () => ({ getRequestEvent: () => current.event }));

const { requireUser, requireRole, auth, CLIENT_ADDRESS_HEADER } = await import('./auth');

function setUser(user: unknown, path = '/builds/new') {
	current.event = { locals: { user }, url: new URL(`http://x${path}`), request: new Request(`http://x${path}`) };
}

function thrown(fn: () => unknown): unknown {
	try {
		fn();
	} catch (e) {
		return e;
	}
	throw new Error('expected the guard to throw');
}

describe('requireUser / requireRole', () => {
	beforeEach(() => setUser(null));

	it('sends signed-out visitors of pages to sign-in with a way back', () => {
		const e = thrown(() => requireUser());
		expect(isRedirect(e) && e.location).toBe('/sign-in?next=%2Fbuilds%2Fnew');
	});

	it('answers 401 to signed-out API callers', () => {
		setUser(null, '/api/v1/builds/x/comments');
		const e = thrown(() => requireUser());
		expect(isHttpError(e) && e.status).toBe(401);
	});

	it('refuses a suspended member even with a session', () => {
		setUser({ id: 'u', role: 'admin', suspendedAt: new Date() });
		const e = thrown(() => requireUser());
		expect(isHttpError(e) && e.status).toBe(403);
	});

	it('lets a role through at or above the required one, 403 below', () => {
		setUser({ id: 'u', role: 'moderator', suspendedAt: null });
		expect(requireRole('reviewer')).toMatchObject({ id: 'u' });
		expect(requireRole('moderator')).toMatchObject({ id: 'u' });
		const e = thrown(() => requireRole('admin'));
		expect(isHttpError(e) && e.status).toBe(403);
		setUser({ id: 'm', role: 'maker', suspendedAt: null });
		expect(isHttpError(thrown(() => requireRole('reviewer')))).toBe(true);
	});
});

describe('sign-in rate limit (better-auth, stored in PostgreSQL)', () => {
	it('answers 429 after 10 attempts a minute from one address', async () => {
		const ip = `10.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}.7`;
		const base = process.env.BETTER_AUTH_URL ?? 'http://127.0.0.1:5173';
		const statuses: number[] = [];
		for (let i = 0; i < 12; i++) {
			const res = await auth.handler(
				new Request(new URL('/api/auth/sign-in/email', base), {
					method: 'POST',
					headers: { 'content-type': 'application/json', [CLIENT_ADDRESS_HEADER]: ip, origin: new URL(base).origin },
					body: JSON.stringify({ email: 'nobody@example.test', password: 'wrong-password-x' })
				})
			);
			statuses.push(res.status);
		}
		expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true);
		expect(statuses.slice(10)).toEqual([429, 429]);
	});
});
