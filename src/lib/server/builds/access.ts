/** Who may see and change a build. Every route and API handler goes through these; hiding a button is never enough. */
import { error } from '@sveltejs/kit';
import { roleAtLeast } from '$lib/roles';
import type { Build } from '../db/schema';
import type { Actor, Viewer } from '../actor';

type BuildAccess = Pick<Build, 'ownerId' | 'status' | 'locked' | 'lockedReason'>;

/** True for the build's maker. */
export function isOwner(viewer: Viewer, build: Pick<Build, 'ownerId'>): boolean {
	return !!viewer && viewer.id === build.ownerId;
}

/** Drafts are seen only by their maker and by admins; published and archived builds by everyone. */
export function canView(viewer: Viewer, build: Pick<Build, 'ownerId' | 'status'>): boolean {
	if (build.status !== 'draft') return true;
	return isOwner(viewer, build) || roleAtLeast(viewer?.role, 'admin');
}

/** The maker (unless a moderator locked the build) or an admin. */
export function canEdit(viewer: Viewer, build: BuildAccess): boolean {
	if (!viewer) return false;
	if (roleAtLeast(viewer.role, 'admin')) return true;
	return isOwner(viewer, build) && !build.locked;
}

/** Moderators and admins lock and unlock builds. */
export function canLock(viewer: Viewer): boolean {
	return roleAtLeast(viewer?.role, 'moderator');
}

/** Any signed-in member can derive a published build. */
export function canDerive(viewer: Viewer, build: Pick<Build, 'status'>): boolean {
	return !!viewer && build.status === 'published';
}

/**
 * Throw unless `viewer` may change `build`: 401 signed out, 404 when they may not even see it (another
 * member's draft), 403 for another member's published build or for the maker of a locked build (with
 * the moderator's reason).
 */
export function assertCanEdit(viewer: Viewer, build: BuildAccess): asserts viewer is Actor {
	if (!viewer) error(401, 'Sign in first.');
	if (canEdit(viewer, build)) return;
	// View before edit: a draft someone may not see is absent (404), never "not yours" (403).
	assertCanView(viewer, build);
	if (isOwner(viewer, build) && build.locked) {
		error(
			403,
			`A moderator has locked this build, so it cannot be changed${build.lockedReason ? `: ${build.lockedReason}` : '.'}`
		);
	}
	error(403, 'Only the maker of this build can change it.');
}

/** Throw 404 unless `viewer` may see `build` (drafts look absent to everyone else). */
export function assertCanView(viewer: Viewer, build: Pick<Build, 'ownerId' | 'status'>): void {
	if (!canView(viewer, build)) error(404, 'Not found');
}
