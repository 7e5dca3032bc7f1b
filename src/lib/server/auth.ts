import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { sveltekitCookies } from 'better-auth/svelte-kit';
import { APIError } from 'better-auth/api';
import { error, redirect } from '@sveltejs/kit';
import { getRequestEvent } from '$app/server';
import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import { eq } from 'drizzle-orm';
import { db } from './db';
import * as schema from './db/schema';
import { composeMail, enqueueMail } from './mail';
import { ROLES, roleAtLeast, type Role } from '$lib/roles';

export { ROLES, roleAtLeast, type Role };

/** Header the server sets to the client's address before better-auth sees a request. */
export const CLIENT_ADDRESS_HEADER = 'x-starground-client';

const baseURL = env.BETTER_AUTH_URL ?? env.ORIGIN ?? 'http://127.0.0.1:5173';

export const auth = betterAuth({
	baseURL,
	// `vite build` loads this module to analyse routes; only then is a placeholder secret used.
	secret: env.BETTER_AUTH_SECRET ?? (building ? 'build-time-placeholder-secret-not-for-use' : undefined),
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
			handle: { type: 'string', required: false, input: false },
			bio: { type: 'string', required: false, defaultValue: '', input: false },
			avatarKey: { type: 'string', required: false, input: false },
			suspendedAt: { type: 'date', required: false, input: false }
		}
	},
	emailAndPassword: {
		enabled: true,
		requireEmailVerification: true,
		minPasswordLength: 10,
		maxPasswordLength: 128,
		revokeSessionsOnPasswordReset: true,
		sendResetPassword: async ({ user, url }) => {
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
		autoSignInAfterVerification: true,
		expiresIn: 60 * 60 * 24,
		sendVerificationEmail: async ({ user, url }) => {
			await enqueueMail(
				composeMail({
					to: user.email,
					subject: 'Confirm your e-mail for Starground',
					paragraphs: [
						`Hello ${user.name},`,
						'Confirm this address to finish creating your Starground account. The link works for 24 hours.'
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
