import type { LayoutServerLoad } from './$types';
import { roleOf } from '$lib/server/actor';

export const load: LayoutServerLoad = ({ locals }) => {
	const u = locals.user;
	return {
		viewer: u ? { id: u.id, name: u.name, handle: u.handle ?? null, role: roleOf(u.role) } : null
	};
};
