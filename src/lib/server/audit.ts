import type { Tx, Db } from './db';
import * as schema from './db/schema';

export interface AuditInput {
	actorId: string;
	action: string;
	targetKind: 'build' | 'comment' | 'member' | 'report' | 'flag' | 'review';
	targetId: string;
	reason?: string;
	details?: Record<string, unknown>;
}

/** Write one audit-log entry in the caller's transaction (every moderator and admin action). */
export async function recordAudit(tx: Tx | Db, entry: AuditInput): Promise<void> {
	await tx.insert(schema.auditEntry).values({
		actorId: entry.actorId,
		action: entry.action,
		targetKind: entry.targetKind,
		targetId: entry.targetId,
		reason: entry.reason ?? '',
		details: entry.details ?? {}
	});
}
