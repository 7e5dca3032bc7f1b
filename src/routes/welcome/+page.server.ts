import type { PageServerLoad } from './$types';

/**
 * Where the confirmation link lands (better-auth's callbackURL). Confirming signs the member in; when the
 * page is reached signed out (link opened a second time, in another browser, or expired) it says how to go on.
 * better-auth adds `?error=INVALID_TOKEN` / `TOKEN_EXPIRED` (its error codes) when the link could not be used.
 */
export const load: PageServerLoad = async ({ locals, url }) => {
	const error = url.searchParams.get('error');
	return {
		member: locals.user ? { name: locals.user.name } : null,
		linkProblem: error && /expired/i.test(error) ? 'expired' : error ? 'invalid' : null
	} as { member: { name: string } | null; linkProblem: 'expired' | 'invalid' | null };
};
