/**
 * Send a multipart upload with progress (photos, attachments): XHR, because fetch reports no upload
 * progress. Resolves with the status and parsed JSON body (null when not JSON); rejects on a broken connection.
 */
export function sendUpload(
	url: string,
	body: FormData,
	on: { progress?: (percent: number) => void; sent?: () => void } = {}
): Promise<{ status: number; json: unknown }> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open('POST', url);
		xhr.setRequestHeader('accept', 'application/json');
		xhr.responseType = 'text';
		xhr.upload.onprogress = (e) => {
			if (e.lengthComputable) on.progress?.(Math.min(100, Math.round((e.loaded / e.total) * 100)));
		};
		xhr.upload.onload = () => on.sent?.();
		xhr.onerror = () => reject(new Error('connection broke'));
		xhr.onload = () => {
			let json: unknown = null;
			try {
				json = JSON.parse(xhr.responseText);
			} catch {
				/* not JSON */
			}
			resolve({ status: xhr.status, json });
		};
		xhr.send(body);
	});
}

/** The server's sentence from the JSON error envelope, or a plain one for the status. */
export function refusalText(status: number, json: unknown, what = 'file'): string {
	const e = (json as { error?: { message?: string; issues?: { message: string }[] } } | null)?.error;
	if (e?.message) {
		const detail = e.issues?.map((i) => i.message).filter((m) => m && m !== e.message) ?? [];
		return [e.message, ...detail].join(' ');
	}
	if (status === 413) return `That ${what} is too large to upload.`;
	if (status === 401) return 'Your session has ended. Sign in again, then retry.';
	if (status === 403) return `You cannot add a ${what} to this build.`;
	return `The upload failed (HTTP ${status || 'no answer'}). Try again.`;
}
