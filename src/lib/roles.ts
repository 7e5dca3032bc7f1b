/** Roles in order of trust (PRODUCT.md §2). Each role can do everything the ones before it can. */
export const ROLES = ['maker', 'reviewer', 'moderator', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** True when `role` is `min` or above. Unknown roles count as maker. */
export function roleAtLeast(role: string | null | undefined, min: Role): boolean {
	const have = ROLES.indexOf((role ?? 'maker') as Role);
	return Math.max(have, 0) >= ROLES.indexOf(min);
}

/** Which roles a member of role `actor` may grant or take away. Admins appoint moderators; moderators appoint reviewers. */
export function assignableRoles(actor: string): Role[] {
	if (actor === 'admin') return ['maker', 'reviewer', 'moderator', 'admin'];
	if (actor === 'moderator') return ['maker', 'reviewer'];
	return [];
}
