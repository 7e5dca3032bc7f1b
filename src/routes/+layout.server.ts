import type { LayoutServerLoad } from './$types';
import { roleOf } from '$lib/server/actor';
import { initials } from '$lib/server/members/makers';

export const load: LayoutServerLoad = ({ locals }) => {
	const u = locals.user;
	return {
		viewer: u
			? {
					id: u.id,
					name: u.name,
					handle: u.handle ?? null,
					role: roleOf(u.role),
					initials: initials(u.name),
					avatarUrl: u.avatarKey ? `/media/${u.avatarKey}` : null
				}
			: null
	};
};
