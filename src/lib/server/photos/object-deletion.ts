/**
 * Deleting stored objects durably. A photo's row goes first (in the transaction that records the
 * revision), then its objects; when the object store does not answer, the deletion becomes a job in
 * the durable queue (pg-boss, in PostgreSQL) and is retried with backoff until it succeeds. Meanwhile
 * /media no longer serves the objects (it serves only objects with a row), so nothing is left visible.
 */
import { env } from '$env/dynamic/private';
import { getBoss } from '../mail';
import { deleteObjects } from './storage';

export const DELETE_QUEUE = 'delete-objects';

interface DeleteJob {
	keys: string[];
}

/** Delete `keys` now; if the store fails, queue the deletion for retries. Never throws for a store outage. */
export async function deleteObjectsDurably(keys: readonly string[]): Promise<'deleted' | 'queued'> {
	if (keys.length === 0) return 'deleted';
	try {
		await deleteObjects(keys);
		return 'deleted';
	} catch (err) {
		console.error(`[storage] deleting ${keys.length} object(s) failed; queued for retry:`, (err as Error).message);
		await queueObjectDeletion(keys);
		return 'queued';
	}
}

/** Put a deletion in the durable queue (retried with exponential backoff, about a day in all). */
export async function queueObjectDeletion(keys: readonly string[]): Promise<void> {
	const boss = await getBoss();
	await boss.createQueue(DELETE_QUEUE).catch(() => {});
	await boss.send(DELETE_QUEUE, { keys: [...keys] } satisfies DeleteJob, {
		retryLimit: Number(env.DELETE_RETRY_LIMIT ?? 20),
		retryDelay: Number(env.DELETE_RETRY_DELAY_S ?? 10),
		retryBackoff: true
	});
}

let working = false;

/** Work the deletion queue from this process (started with the mail worker). */
export async function startDeletionWorker(): Promise<void> {
	if (working) return;
	working = true;
	const boss = await getBoss();
	await boss.createQueue(DELETE_QUEUE).catch(() => {});
	await boss.work<DeleteJob>(DELETE_QUEUE, { pollingIntervalSeconds: Number(env.MAIL_POLL_S ?? 1), batchSize: 5 }, async (jobs) => {
		for (const job of jobs) await deleteObjects(job.data.keys);
	});
}
