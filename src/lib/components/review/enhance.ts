/**
 * `use:enhance` for forms that post to another route's action (flag and review-request forms shown on the
 * build page): stay on the current page, refresh its data on success, and hand a failure's sentence back
 * to the component instead of touching the page's own `form` prop.
 */
import { invalidateAll } from '$app/navigation';
import type { SubmitFunction } from '@sveltejs/kit';

export function stayHere(onDone: (error: string | null, done?: string | null) => void, onStart?: () => void): SubmitFunction {
	return () => {
		onStart?.();
		return async ({ result, formElement }) => {
			if (result.type === 'redirect' || result.type === 'success') {
				formElement.reset();
				await invalidateAll();
				// The `?done=` code of the page the action would have gone to ($lib/outcomes).
				const done = result.type === 'redirect' ? new URL(result.location, window.location.href).searchParams.get('done') : null;
				onDone(null, done);
			} else if (result.type === 'failure') {
				const data = result.data as { error?: string } | undefined;
				onDone(data?.error ?? 'That did not work. Check the form and try again.');
			} else if (result.type === 'error') {
				onDone((result.error as { message?: string } | undefined)?.message ?? 'Something went wrong on our side.');
			}
		};
	};
}
