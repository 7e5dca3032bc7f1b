// Throwaway members for end-to-end tests: signed up through the form and confirmed through the mailed link,
// so a test can change a profile or use up a budget without touching the demo members.
import { expect, type APIRequestContext } from '@playwright/test';
import { waitForMail, linkIn } from './mail';
import { origin } from './builds';

export const THROWAWAY_PASSWORD = 'matrix-password-1';

/** POST a form as a browser without JavaScript does (urlencoded, same Origin, wants a page). */
export function postPage(c: APIRequestContext, path: string, form: Record<string, string>) {
	return c.post(path, { form, headers: { origin: origin(), accept: 'text/html' }, maxRedirects: 0 });
}

/** Sign up a throwaway maker on `c` and confirm the address; `c` ends up signed in. */
export async function throwawayMember(c: APIRequestContext, prefix: string): Promise<{ handle: string; email: string }> {
	const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
	const handle = `${prefix}${stamp}`.slice(0, 24);
	const email = `${prefix}-${stamp}@example.test`;
	const res = await postPage(c, '/sign-up', { name: `Matrix ${prefix} ${stamp}`, handle, email, password: THROWAWAY_PASSWORD });
	expect(res.status(), `sign up ${email}`).toBe(303);
	const mail = await waitForMail(email, /Confirm your e-mail/);
	const verify = await c.get(linkIn(mail, '/api/auth/verify-email'), { maxRedirects: 0 });
	expect(verify.status()).toBeLessThan(400);
	const signIn = await postPage(c, '/sign-in', { email, password: THROWAWAY_PASSWORD });
	expect(signIn.status(), `sign in ${email}`).toBe(303);
	return { handle, email };
}
