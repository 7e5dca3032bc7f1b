/**
 * Budgets for the account forms (sign-up, password reset, confirmation mail, sign-in failures),
 * counted in PostgreSQL through the shared limiter table so every app process sees one count.
 * Each budget is keyed both by client address and by e-mail address where it matters, so neither a
 * flood from one address nor many addresses aimed at one inbox gets through.
 */
import { env } from '$env/dynamic/private';
import { createLimiter, type Verdict } from '../rate-limit';

const HOUR_S = 60 * 60;

function numberFrom(name: string, fallback: number): number {
	const n = Number(env[name]);
	return Number.isFinite(n) && n >= 1 ? Math.floor(n) : fallback;
}

/** False when `AUTH_RATE_LIMIT=off` (local experiments only). */
export const accountLimitsOn = () => env.AUTH_RATE_LIMIT !== 'off';

type Limiter = ReturnType<typeof createLimiter>;
const cache = new Map<string, Limiter>();
function limiter(keyPrefix: string, points: number, durationS: number): Limiter {
	const id = `${keyPrefix}:${points}:${durationS}`;
	let l = cache.get(id);
	if (!l) {
		l = createLimiter({ keyPrefix, points, durationS });
		cache.set(id, l);
	}
	return l;
}

/** The budgets, read from the environment on each use (README lists the variables). */
export const budgets = {
	/** Sign-up attempts per client address per hour (`AUTH_SIGNUP_PER_HOUR`, 10). */
	signUpByAddress: () => limiter('signup-address', numberFrom('AUTH_SIGNUP_PER_HOUR', 10), HOUR_S),
	/** Account mails (confirmation, reset, "someone tried") per e-mail address and kind per hour (`AUTH_MAIL_PER_HOUR`, 3). */
	mailByEmail: () => limiter('account-mail', numberFrom('AUTH_MAIL_PER_HOUR', 3), HOUR_S),
	/** Reset and resend requests per client address per hour (`AUTH_RESET_PER_HOUR`, 20). */
	requestsByAddress: () => limiter('account-request-address', numberFrom('AUTH_RESET_PER_HOUR', 20), HOUR_S),
	/** Failed sign-ins per account per 15 minutes (`AUTH_ACCOUNT_FAILURES_MAX`, 10). */
	signInFailuresByAccount: () => limiter('signin-failures', numberFrom('AUTH_ACCOUNT_FAILURES_MAX', 10), 15 * 60)
};

const ok: Verdict = { ok: true, remaining: Infinity };

/** Count one use of `budget` for `key`; always ok when limits are off. */
export async function consume(budget: keyof typeof budgets, key: string): Promise<Verdict> {
	if (!accountLimitsOn()) return ok;
	return budgets[budget]().consume(key.toLowerCase());
}

/** Seconds `key` must wait under `budget` (0: go ahead), counting nothing. */
export async function blockedFor(budget: keyof typeof budgets, key: string): Promise<number> {
	if (!accountLimitsOn()) return 0;
	return budgets[budget]().blockedFor(key.toLowerCase());
}

/** "Try again in 12 minutes." / "… in 40 seconds." */
export function waitSentence(retryAfterS: number): string {
	if (retryAfterS >= 90) {
		const m = Math.ceil(retryAfterS / 60);
		return `Try again in ${m} minutes.`;
	}
	return `Try again in ${retryAfterS} second${retryAfterS === 1 ? '' : 's'}.`;
}
