import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth';
import { listMembers } from '$lib/server/members';
import { setMemberRole, setMemberSuspended } from '$lib/server/moderation';
import { attempt } from '$lib/server/http';
import { ROLES, assignableRoles } from '$lib/roles';
import type { Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';

export const load: PageServerLoad = async ({ url }) => {
	const actor = actorOf(requireRole('moderator'));
	const q = url.searchParams.get('q') ?? '';
	const showEmail = actor.role === 'admin';
	return { q, showEmail, members: await listMembers(q, { withEmail: showEmail }), assignable: assignableRoles(actor.role), me: actor.id };
};

const roleForm = z.object({ userId: z.string().min(1), role: z.enum(ROLES), reason: z.string().max(500).default('') });
const suspendForm = z.object({ userId: z.string().min(1), reason: z.string().trim().min(3, 'Give a reason (at least 3 characters).').max(500) });
const restoreForm = z.object({ userId: z.string().min(1), reason: z.string().max(500).default('') });

export const actions: Actions = {
	setRole: async ({ request }) => {
		const actor = actorOf(requireRole('moderator'));
		const parsed = roleForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { error: 'Choose a valid role.' });
		const r = await attempt(() => setMemberRole(actor, parsed.data.userId, parsed.data.role, parsed.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Role changed.' };
	},
	suspend: async ({ request }) => {
		const actor = actorOf(requireRole('moderator'));
		const parsed = suspendForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0].message, userId: null });
		const r = await attempt(() => setMemberSuspended(actor, parsed.data.userId, true, parsed.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Member suspended; their sessions have ended.' };
	},
	restore: async ({ request }) => {
		const actor = actorOf(requireRole('moderator'));
		const parsed = restoreForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { error: 'Invalid request.' });
		const r = await attempt(() => setMemberSuspended(actor, parsed.data.userId, false, parsed.data.reason));
		if (!r.ok) return r.failure;
		return { ok: 'Member restored.' };
	}
};
