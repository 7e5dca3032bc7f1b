import { and, eq, lt } from 'drizzle-orm';
import type { Cookies } from '@sveltejs/kit';
import { parseSetCookieHeader, toCookieOptions } from 'better-auth/cookies';
import { hashPassword } from 'better-auth/crypto';
import { env } from '$env/dynamic/private';
import { auth, CLIENT_ADDRESS_HEADER, UNCONFIRMED_RELEASE_DAYS } from '../auth';
import { db } from '../db';
import * as schema from '../db/schema';
import { composeMail, enqueueMail } from '../mail';
import { blockedFor, consume, waitSentence } from './limits';
import { passwordProblem } from './password';

export { passwordProblem } from './password';

export type SignInResult =
	| { ok: true }
	| { ok: false; status: number; code: string; message: string };

export type FormResult<F extends string = string> =
	| { ok: true }
	| { ok: false; status: number; message: string; field?: F };

const base = () => env.BETTER_AUTH_URL ?? env.ORIGIN ?? 'http://127.0.0.1:5173';

const SIGN_IN_FAILURES_MESSAGE = 'Too many failed sign-ins for this account.';

/**
 * Sign in through better-auth's own HTTP endpoint, so its rate limiter (stored in PostgreSQL, keyed
 * by client address) applies; failed attempts also count per account, so spreading guesses over many
 * addresses does not help either. Used by the sign-in form and by `POST /api/auth/sign-in/email`.
 */
export async function passwordSignIn(email: string, password: string, clientAddress: string): Promise<Response> {
	const account = email.trim().toLowerCase();
	const wait = await blockedFor('signInFailuresByAccount', account);
	if (wait) {
		return Response.json(
			{ code: 'TOO_MANY_FAILURES', message: `${SIGN_IN_FAILURES_MESSAGE} ${waitSentence(wait)}` },
			{ status: 429, headers: { 'retry-after': String(wait) } }
		);
	}
	const url = new URL('/api/auth/sign-in/email', base());
	const res = await auth.handler(
		new Request(url, {
			method: 'POST',
			headers: { 'content-type': 'application/json', [CLIENT_ADDRESS_HEADER]: clientAddress, origin: url.origin },
			body: JSON.stringify({ email: account, password, rememberMe: true, callbackURL: '/welcome' })
		})
	);
	if (res.status === 401) await consume('signInFailuresByAccount', account);
	return res;
}

/** The sign-in form: copies the session cookies onto the current response and words the refusals. */
export async function signInWithPassword(
	email: string,
	password: string,
	clientAddress: string,
	cookies: Cookies
): Promise<SignInResult> {
	const res = await passwordSignIn(email, password, clientAddress);
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
		EMAIL_NOT_VERIFIED:
			'Confirm your e-mail first: we have sent the link again (at most three times an hour). Nothing arrived? Ask for a new link on the resend page.',
		ACCOUNT_SUSPENDED: 'This account is suspended. Contact the moderators if you think this is a mistake.'
	};
	let message = messages[code] ?? body.message ?? 'Sign-in failed.';
	if (res.status === 429) {
		message = code === 'TOO_MANY_FAILURES' ? (body.message ?? SIGN_IN_FAILURES_MESSAGE) : 'Too many sign-in attempts. Wait a minute and try again.';
	}
	if (res.status === 403 && /suspend/i.test(body.message ?? '')) message = messages.ACCOUNT_SUSPENDED;
	return { ok: false, status: res.status, code, message };
}

/** True when no member holds `handle`. */
export async function handleIsFree(handle: string): Promise<boolean> {
	const rows = await db.select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.handle, handle)).limit(1);
	return rows.length === 0;
}

/**
 * Remove accounts whose e-mail was not confirmed within UNCONFIRMED_RELEASE_DAYS days, so their
 * handle and address can be used again. Such an account could never sign in, so it holds nothing else.
 */
export async function releaseUnconfirmed(now = new Date()): Promise<number> {
	const before = new Date(now.getTime() - UNCONFIRMED_RELEASE_DAYS * 24 * 60 * 60 * 1000);
	const gone = await db
		.delete(schema.user)
		.where(and(eq(schema.user.emailVerified, false), lt(schema.user.createdAt, before)))
		.returning({ id: schema.user.id });
	return gone.length;
}

/** Run work after the answer has gone out, so its duration tells nothing; failures are logged. */
function detached(what: string, work: () => Promise<unknown>): void {
	void work().catch((err) => console.error(`[account] ${what} failed:`, err));
}

async function sendConfirmation(email: string): Promise<void> {
	await auth.api.sendVerificationEmail({ body: { email, callbackURL: '/welcome' } });
}

async function tellOwnerSomeoneTried(to: string, name: string): Promise<void> {
	if (!(await consume('mailByEmail', `tried:${to}`)).ok) return;
	await enqueueMail(
		composeMail({
			to,
			subject: 'Someone tried to create a Starground account with your address',
			paragraphs: [
				`Hello ${name},`,
				'Someone just tried to create a new Starground account with this e-mail address. You already have an account, so nothing was created and nothing changed.',
				'If it was you: sign in instead, or choose a new password if you have forgotten it. If it was not you, you can ignore this message.'
			],
			action: { label: 'Sign in', url: new URL('/sign-in', base()).toString() }
		})
	);
}

type SignUpField = 'handle' | 'password' | 'email';

/**
 * Create an account and send the confirmation mail. The answer is the same whether or not the
 * address already has an account (its owner gets a mail saying someone tried, or — unconfirmed — the
 * confirmation link again), and both paths hash the password, so the time taken tells nothing either.
 * Attempts are limited per client address and per e-mail address.
 */
export async function signUp(
	input: { name: string; handle: string; email: string; password: string },
	clientAddress: string
): Promise<FormResult<SignUpField>> {
	for (const key of [`address:${clientAddress}`, `email:${input.email}`]) {
		const verdict = await consume('signUpByAddress', key);
		if (!verdict.ok) return { ok: false, status: 429, message: `Too many sign-ups in a short time. ${waitSentence(verdict.retryAfterS)}` };
	}
	const problem = passwordProblem(input.password, [input.email, input.name, input.handle]);
	if (problem) return { ok: false, status: 400, field: 'password', message: problem };
	await releaseUnconfirmed();
	if (!(await handleIsFree(input.handle))) return { ok: false, status: 400, field: 'handle', message: 'That handle is taken; pick another.' };

	const [existing] = await db
		.select({ name: schema.user.name, emailVerified: schema.user.emailVerified })
		.from(schema.user)
		.where(eq(schema.user.email, input.email))
		.limit(1);
	if (existing) {
		await hashPassword(input.password);
		detached('sign-up notice', () =>
			existing.emailVerified ? tellOwnerSomeoneTried(input.email, existing.name) : sendConfirmation(input.email)
		);
		return { ok: true };
	}
	try {
		await auth.api.signUpEmail({
			body: { name: input.name, email: input.email, password: input.password, handle: input.handle, callbackURL: '/welcome' }
		});
	} catch (err) {
		// Two sign-ups racing for one handle or address: the unique index decides.
		const text = String((err as { message?: string; cause?: unknown })?.message ?? '') + String((err as { cause?: unknown }).cause ?? '');
		if (/handle/i.test(text)) return { ok: false, status: 400, field: 'handle', message: 'That handle is taken; pick another.' };
		if (/already exists|email/i.test(text)) return { ok: true };
		throw err;
	}
	return { ok: true };
}

/**
 * Ask for a password-reset mail. Limited per client address here and per inbox where the mail is
 * composed; the lookup runs after the answer has gone out, so neither the answer nor its timing says
 * whether the address has an account.
 */
export async function requestPasswordReset(email: string, clientAddress: string): Promise<FormResult> {
	const verdict = await consume('requestsByAddress', `address:${clientAddress}`);
	if (!verdict.ok) return { ok: false, status: 429, message: `Too many requests from your address. ${waitSentence(verdict.retryAfterS)}` };
	detached('password reset', () => auth.api.requestPasswordReset({ body: { email, redirectTo: '/reset-password' } }));
	return { ok: true };
}

/**
 * Send the confirmation link again to an account that is not confirmed yet. Same answer for every
 * address; limited per client address and per inbox.
 */
export async function resendConfirmation(email: string, clientAddress: string): Promise<FormResult> {
	const verdict = await consume('requestsByAddress', `address:${clientAddress}`);
	if (!verdict.ok) return { ok: false, status: 429, message: `Too many requests from your address. ${waitSentence(verdict.retryAfterS)}` };
	detached('confirmation resend', async () => {
		const [u] = await db
			.select({ emailVerified: schema.user.emailVerified })
			.from(schema.user)
			.where(eq(schema.user.email, email))
			.limit(1);
		if (u && !u.emailVerified) await sendConfirmation(email);
	});
	return { ok: true };
}
