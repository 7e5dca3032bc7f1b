/**
 * Who is acting or looking. Every domain module takes an `Actor` (or a `Viewer`, which may be signed out);
 * routes turn the session's member into one with `actorOf(locals.user)` / `actorOf(requireUser())`.
 */
import { ROLES, type Role } from '$lib/roles';

/** A signed-in member as the domain modules see them: id, role (unknown roles count as maker), name. */
export interface Actor {
	id: string;
	role: Role;
	name?: string;
}

/** The member looking at something, or null/undefined when signed out. */
export type Viewer = Actor | null | undefined;

/** What a session (or a test) knows about a member: enough to make an Actor. */
interface MemberLike {
	id: string;
	role?: string | null;
	name?: string | null;
}

/** The role as one of ROLES; anything else counts as maker (the lowest trust). */
export function roleOf(role: string | null | undefined): Role {
	return (ROLES as readonly string[]).includes(role ?? '') ? (role as Role) : 'maker';
}

/** The Actor for a member from the session (`locals.user`, `requireUser()`); null when signed out. */
export function actorOf(user: MemberLike): Actor;
export function actorOf(user: MemberLike | null | undefined): Actor | null;
export function actorOf(user: MemberLike | null | undefined): Actor | null {
	if (!user) return null;
	return { id: user.id, role: roleOf(user.role), ...(user.name ? { name: user.name } : {}) };
}
