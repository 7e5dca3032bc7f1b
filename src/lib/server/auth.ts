import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { sveltekitCookies } from 'better-auth/svelte-kit';
import { APIError, createAuthMiddleware } from 'better-auth/api';
import { error, redirect } from '@sveltejs/kit';
import { getRequestEvent } from '$app/server';
import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import { eq } from 'drizzle-orm';
import { db } from './db';
import * as schema from './db/schema';
import { composeMail, enqueueMail } from './mail';
import { ROLES, roleAtLeast, type Role } from '$lib/roles';
import { handle as handleSchema, displayName } from '$lib/schemas/account';
import { consume } from './members/limits';
import { passwordProblem, PASSWORD_MAX, PASSWORD_MIN } from './members/password';

export { ROLES, roleAtLeast, type Role };

/** Header the server sets to the client's address before better-auth sees a request. */
export const CLIENT_ADDRESS_HEADER = 'x-starground-client';

const baseURL = env.BETTER_AUTH_URL ?? env.ORIGIN ?? 'http://127.0.0.1:5173';

/** An account whose e-mail is not confirmed within this many days is removed, freeing its handle and address. */
export const UNCONFIRMED_RELEASE_DAYS = 7;

/** Shortest secret accepted: 32 characters (256 bits when hex or base64 from a random source). */
export const SECRET_MIN_LENGTH = 32;

/**
 * The signing secret, or a refusal to start: without one, better-auth would fall back to a public
 * default outside production and anyone could forge verification and reset tokens. `npm start` and
 * `npm test` generate one; everywhere else it must be set.
 */
export function authSecret(value: string | undefined, isBuilding = building): string {
	// `vite build` loads this module to analyse routes; only then is a placeholder used.
	if (isBuilding) return 'build-time-placeholder-secret-not-for-use';
	if (!value || value.trim().length < SECRET_MIN_LENGTH) {
		throw new Error(
			`BETTER_AUTH_SECRET must be set to a random value of at least ${SECRET_MIN_LENGTH} characters ` +
				'(for example the output of `openssl rand -hex 32`). Refusing to start without it.'
		);
	}
	return value.trim();
}

/**
 * Endpoints of better-auth that we serve over HTTP; every other one answers 404. Sign-up, password
 * reset requests, resending confirmation and profile changes go through our own forms, which validate
 * and rate-limit them. (Listed in `disabledPaths` too, so the library refuses them on its own.)
 */
export const AUTH_HTTP_PATHS = ['/sign-in/email', '/sign-out', '/get-session', '/verify-email', '/reset-password/', '/ok', '/error'];

const DISABLED_PATHS = [
	'/account-info', '/change-email', '/change-password', '/delete-user', '/delete-user/callback',
	'/get-access-token', '/link-social', '/list-accounts', '/list-sessions', '/refresh-token',
	'/request-password-reset', '/reset-password', '/revoke-other-sessions', '/revoke-session',
	'/revoke-sessions', '/send-verification-email', '/sign-in/social', '/sign-up/email',
	'/unlink-account', '/update-session', '/update-user', '/verify-password'
];

const refuse = (message: string) => new APIError('BAD_REQUEST', { message, code: 'INVALID_INPUT' });

/**
 * Our rules for the library's endpoints, also when they are called from our own code: a handle on
 * every new account, names and passwords checked like the forms check them.
 */
const validateAuthInput = createAuthMiddleware(async (ctx) => {
	const body = (ctx.body ?? {}) as Record<string, unknown>;
	if (ctx.path === '/sign-up/email') {
		const handle = handleSchema.safeParse(body.handle);
		if (!handle.success) throw refuse('Choose a handle: ' + handle.error.issues[0].message);
		const name = displayName.safeParse(body.name);
		if (!name.success) throw refuse(name.error.issues[0].message);
		const problem = passwordProblem(String(body.password ?? ''), [String(body.email ?? ''), name.data, handle.data]);
		if (problem) throw refuse(problem);
	}
	if (ctx.path === '/update-user') {
		for (const key of Object.keys(body)) if (key !== 'name') throw refuse(`${key} cannot be changed here.`);
		const name = displayName.safeParse(body.name);
		if (!name.success) throw refuse(name.error.issues[0].message);
	}
	if (ctx.path === '/reset-password' || ctx.path === '/change-password') {
		const problem = passwordProblem(String(body.newPassword ?? ''));
		if (problem) throw refuse(problem);
	}
});

export const auth = betterAuth({
	baseURL,
	secret: authSecret(env.BETTER_AUTH_SECRET),
	disabledPaths: DISABLED_PATHS,
	hooks: { before: validateAuthInput },
	database: drizzleAdapter(db, {
		provider: 'pg',
		schema: {
			user: schema.user,
			session: schema.session,
			account: schema.account,
			verification: schema.verification,
			rateLimit: schema.rateLimit
		}
	}),
	trustedOrigins: [baseURL],
	user: {
		additionalFields: {
			role: { type: 'string', required: false, defaultValue: 'maker', input: false },
			// Set at sign-up only (checked in validateAuthInput); update-user refuses it.
			handle: { type: 'string', required: false, input: true },
			bio: { type: 'string', required: false, defaultValue: '', input: false },
			avatarKey: { type: 'string', required: false, input: false },
			suspendedAt: { type: 'date', required: false, input: false }
		}
	},
	emailAndPassword: {
		enabled: true,
		requireEmailVerification: true,
		minPasswordLength: PASSWORD_MIN,
		maxPasswordLength: PASSWORD_MAX,
		revokeSessionsOnPasswordReset: true,
		sendResetPassword: async ({ user, url }) => {
			// At most AUTH_MAIL_PER_HOUR reset mails an hour reach one inbox, however many are asked for.
			if (!(await consume('mailByEmail', `reset:${user.email}`)).ok) return;
			await enqueueMail(
				composeMail({
					to: user.email,
					subject: 'Reset your Starground password',
					paragraphs: [
						`Hello ${user.name},`,
						'Someone (hopefully you) asked to reset the password of this Starground account. The link works for one hour.',
						'If it was not you, ignore this message; your password stays as it is.'
					],
					action: { label: 'Choose a new password', url }
				})
			);
		}
	},
	emailVerification: {
		sendOnSignUp: true,
		// Signing in to an unconfirmed account sends the link again (within the mail budget below).
		sendOnSignIn: true,
		autoSignInAfterVerification: true,
		expiresIn: 60 * 60 * 24,
		sendVerificationEmail: async ({ user, url }) => {
			if (!(await consume('mailByEmail', `confirm:${user.email}`)).ok) return;
			await enqueueMail(
				composeMail({
					to: user.email,
					subject: 'Confirm your e-mail for Starground',
					paragraphs: [
						`Hello ${user.name},`,
						'Confirm this address to finish creating your Starground account. The link works for 24 hours.',
						`An account that is not confirmed within ${UNCONFIRMED_RELEASE_DAYS} days is removed, and its handle becomes free again.`
					],
					action: { label: 'Confirm my e-mail', url }
				})
			);
		}
	},
	rateLimit: {
		enabled: env.AUTH_RATE_LIMIT !== 'off',
		storage: 'database',
		window: 60,
		max: 100,
		customRules: {
			'/sign-in/email': { window: 60, max: Number(env.AUTH_SIGNIN_MAX ?? 10) },
			'/sign-up/email': { window: 60, max: 10 },
			'/request-password-reset': { window: 60, max: 5 }
		}
	},
	advanced: {
		ipAddress: { ipAddressHeaders: [CLIENT_ADDRESS_HEADER] }
	},
	databaseHooks: {
		session: {
			create: {
				before: async (session) => {
					const [u] = await db
						.select({ suspendedAt: schema.user.suspendedAt })
						.from(schema.user)
						.where(eq(schema.user.id, session.userId));
					if (u?.suspendedAt) {
						throw new APIError('FORBIDDEN', { message: 'This account is suspended.', code: 'ACCOUNT_SUSPENDED' });
					}
				}
			}
		}
	},
	plugins: [sveltekitCookies(getRequestEvent)]
});

export type SessionUser = typeof auth.$Infer.Session.user;
export type SessionData = typeof auth.$Infer.Session.session;

/** The signed-in member, or a redirect to sign-in (pages) / 401 (API). Suspended members are refused. */
export function requireUser(): SessionUser {
	const event = getRequestEvent();
	const user = event.locals.user;
	if (!user) {
		if (event.url.pathname.startsWith('/api/') || event.request.headers.get('accept')?.includes('application/json')) {
			error(401, 'Sign in first.');
		}
		redirect(303, `/sign-in?next=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	}
	if (user.suspendedAt) error(403, 'This account is suspended.');
	return user;
}

/** The signed-in member if their role is at least `role`; otherwise 403. */
export function requireRole(role: Role): SessionUser {
	const user = requireUser();
	if (!roleAtLeast(user.role as Role, role)) error(403, `This needs the ${role} role.`);
	return user;
}
