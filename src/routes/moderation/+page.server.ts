import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth';
import { attempt } from '$lib/server/http';
import { actorOf } from '$lib/server/actor';
import {
	closeReport,
	listHiddenComments,
	listLockedBuilds,
	listReports,
	setBuildLocked,
	setCommentHidden,
	setMemberRole,
	setMemberSuspended
} from '$lib/server/moderation';
import { moderationReason } from '$lib/schemas/review';
import type { Actions, PageServerLoad } from './$types';

/** The moderation desk: the report queue with context, hidden comments and locked builds. Moderators and up. */
export const load: PageServerLoad = async () => {
	const user = actorOf(requireRole('moderator'));
	const [open, closed, locked, hidden] = await Promise.all([listReports('open'), listReports('closed', 20), listLockedBuilds(), listHiddenComments()]);
	return { open, closed, locked, hidden, me: { id: user.id, role: user.role } };
};

const id = z.string().trim().min(1).max(100);
const withReason = <T extends z.ZodRawShape>(shape: T) => z.object({ ...shape, reason: moderationReason });

/** Parse the posted form; on failure answer 400 with the first message. */
async function parse<T extends z.ZodTypeAny>(request: Request, schema: T) {
	const data = Object.fromEntries(await request.formData());
	const parsed = schema.safeParse(data);
	if (!parsed.success) return { error: fail(400, { error: parsed.error.issues[0].message, target: String(data.target ?? '') }) };
	return { data: parsed.data as z.infer<T>, target: String(data.target ?? '') };
}

const actor = () => actorOf(requireRole('moderator'));

export const actions: Actions = {
	hideComment: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ commentId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => setCommentHidden(me, p.data.commentId, true, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Comment hidden from readers; reports about it are closed.', target: p.target };
	},
	restoreComment: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ commentId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => setCommentHidden(me, p.data.commentId, false, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Comment restored.', target: p.target };
	},
	lockBuild: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ buildId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => setBuildLocked(me, p.data.buildId, true, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Build locked; its maker sees your reason. Reports about it are closed.', target: p.target };
	},
	unlockBuild: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ buildId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => setBuildLocked(me, p.data.buildId, false, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Build unlocked.', target: p.target };
	},
	suspendMember: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ userId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => setMemberSuspended(me, p.data.userId, true, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Member suspended; their sessions have ended.', target: p.target };
	},
	restoreMember: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ userId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => setMemberSuspended(me, p.data.userId, false, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Member restored.', target: p.target };
	},
	setReviewer: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ userId: id, role: z.enum(['reviewer', 'maker']) }));
		if (p.error) return p.error;
		const r = await attempt(() => setMemberRole(me, p.data.userId, p.data.role, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: p.data.role === 'reviewer' ? 'Appointed as reviewer.' : 'Reviewer role revoked.', target: p.target };
	},
	closeReport: async ({ request }) => {
		const me = actor();
		const p = await parse(request, withReason({ reportId: id }));
		if (p.error) return p.error;
		const r = await attempt(() => closeReport(me, p.data.reportId, p.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Report closed.', target: p.target };
	}
};
