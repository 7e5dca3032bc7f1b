import { fail, isHttpError } from '@sveltejs/kit';

/**
 * Run a form action's domain call and turn an expected refusal (403 another maker or a lock, 409 wrong
 * state, 422 a rule) into `fail(status, { error })`, so the page shows the sentence and the response
 * keeps the status. 404 and unexpected errors pass through to the error page.
 */
export async function runAction<T>(fn: () => Promise<T>) {
	try {
		return await fn();
	} catch (e) {
		if (isHttpError(e) && e.status >= 400 && e.status < 500 && e.status !== 404 && e.status !== 401) {
			return fail(e.status, { error: e.body.message });
		}
		throw e;
	}
}
