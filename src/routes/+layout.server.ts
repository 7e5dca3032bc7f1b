import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = ({ locals }) => {
	const u = locals.user;
	return {
		viewer: u ? { id: u.id, name: u.name, handle: u.handle ?? null, role: (u.role as string) ?? 'maker' } : null
	};
};
