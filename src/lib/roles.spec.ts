import { describe, it, expect } from 'vitest';
import { ROLES, roleAtLeast, assignableRoles } from './roles';

// Rules from PRODUCT.md §2 (roles table): each role can do everything the ones before it can;
// admins appoint moderators, moderators appoint reviewers.
describe('roles', () => {
	it('orders roles by trust', () => {
		expect(ROLES).toEqual(['maker', 'reviewer', 'moderator', 'admin']);
		expect(roleAtLeast('admin', 'moderator')).toBe(true);
		expect(roleAtLeast('moderator', 'reviewer')).toBe(true);
		expect(roleAtLeast('reviewer', 'moderator')).toBe(false);
		expect(roleAtLeast('maker', 'reviewer')).toBe(false);
	});
	it('treats unknown or missing roles as maker', () => {
		expect(roleAtLeast(undefined, 'maker')).toBe(true);
		expect(roleAtLeast('superuser', 'reviewer')).toBe(false);
	});
	it('lets admins appoint moderators and moderators only reviewers', () => {
		expect(assignableRoles('admin')).toContain('moderator');
		expect(assignableRoles('moderator')).toEqual(['maker', 'reviewer']);
		expect(assignableRoles('reviewer')).toEqual([]);
		expect(assignableRoles('maker')).toEqual([]);
	});
});
