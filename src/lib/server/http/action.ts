import { fail, isHttpError, type ActionFailure } from '@sveltejs/kit';

/** A refusal a form action shows on its page: the status it answers with and the sentence. */
export interface Refusal {
	ok: false;
	status: number;
	error: string;
	/** `fail(status, { error })`, ready to return from the action. */
	failure: ActionFailure<{ error: string }>;
}

/** What `attempt` gives back: the domain call's value, or the refusal it threw. */
export type Attempt<T> = { ok: true; value: T } | Refusal;

/**
 * Run a form action's domain call. An expected refusal (403 another maker or a lock, 409 wrong state,
 * 422 a rule, 429 too many) becomes `{ ok: false, status, error, failure }`, so the page shows the sentence
 * and the response keeps the status; otherwise `{ ok: true, value }`. 401, 404 and unexpected errors pass
 * through (sign-in, the error page). Every action uses it the same way:
 *
 *     const r = await attempt(() => publish(actor, b.id));
 *     if (!r.ok) return r.failure;
 *     return { ok: `Published as r${r.value}.` };
 */
export async function attempt<T>(fn: () => Promise<T>): Promise<Attempt<T>> {
	try {
		return { ok: true, value: await fn() };
	} catch (e) {
		if (isHttpError(e) && e.status >= 400 && e.status < 500 && e.status !== 404 && e.status !== 401) {
			const error = e.body.message;
			return { ok: false, status: e.status, error, failure: fail(e.status, { error }) };
		}
		throw e;
	}
}
