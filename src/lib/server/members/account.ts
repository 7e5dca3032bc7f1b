import { eq } from 'drizzle-orm';
import type { Cookies } from '@sveltejs/kit';
import { parseSetCookieHeader, toCookieOptions } from 'better-auth/cookies';
import { env } from '$env/dynamic/private';
import { auth, CLIENT_ADDRESS_HEADER } from '../auth';
import { db } from '../db';
import * as schema from '../db/schema';

export type SignInResult =
	| { ok: true }
	| { ok: false; status: number; code: string; message: string };

/**
 * Sign in through better-auth's own HTTP endpoint, so its rate limiter (stored in PostgreSQL,
 * keyed by client address) applies to the form too. The session cookies it answers with are
 * copied onto the current response.
 */
export async function signInWithPassword(
	email: string,
	password: string,
	clientAddress: string,
	cookies: Cookies
): Promise<SignInResult> {
	const base = env.BETTER_AUTH_URL ?? env.ORIGIN ?? 'http://127.0.0.1:5173';
	const res = await auth.handler(
		new Request(new URL('/api/auth/sign-in/email', base), {
			method: 'POST',
			headers: { 'content-type': 'application/json', [CLIENT_ADDRESS_HEADER]: clientAddress, origin: new URL(base).origin },
			body: JSON.stringify({ email, password, rememberMe: true })
		})
	);
	if (res.ok) {
		const setCookie = res.headers.get('set-cookie');
		for (const [name, attrs] of setCookie ? parseSetCookieHeader(setCookie) : []) {
			cookies.set(name, attrs.value, { ...toCookieOptions(attrs), path: attrs.path || '/' });
		}
		return { ok: true };
	}
	const body = (await res.json().catch(() => ({}))) as { code?: string; message?: string };
	const code = body.code ?? String(res.status);
	const messages: Record<string, string> = {
		INVALID_EMAIL_OR_PASSWORD: 'That e-mail and password do not match an account.',
		EMAIL_NOT_VERIFIED: 'Confirm your e-mail first — we have sent the link again.',
		ACCOUNT_SUSPENDED: 'This account is suspended. Contact the moderators if you think this is a mistake.'
	};
	let message = messages[code] ?? body.message ?? 'Sign-in failed.';
	if (res.status === 429) message = 'Too many sign-in attempts. Wait a minute and try again.';
	if (res.status === 403 && /suspend/i.test(body.message ?? '')) message = messages.ACCOUNT_SUSPENDED;
	return { ok: false, status: res.status, code, message };
}

/** True when no member holds `handle`. */
export async function handleIsFree(handle: string): Promise<boolean> {
	const rows = await db.select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.handle, handle)).limit(1);
	return rows.length === 0;
}

/** True when an account uses `email`. */
export async function emailTaken(email: string): Promise<boolean> {
	const rows = await db.select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.email, email)).limit(1);
	return rows.length > 0;
}

/**
 * Create an account and send the verification mail. The handle is written in the same
 * step; when anything fails after the user row exists, the row is removed again.
 */
export async function signUp(input: { name: string; handle: string; email: string; password: string }): Promise<void> {
	const res = await auth.api.signUpEmail({
		body: { name: input.name, email: input.email, password: input.password, callbackURL: '/welcome' }
	});
	try {
		await db.update(schema.user).set({ handle: input.handle }).where(eq(schema.user.id, res.user.id));
	} catch (err) {
		await db.delete(schema.user).where(eq(schema.user.id, res.user.id));
		throw err;
	}
}
