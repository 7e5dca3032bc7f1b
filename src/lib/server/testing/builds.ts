// Integration-test helpers for builds: throwaway members of any role, cleaned up by id; the fields of a new
// build; the HTTP status a guarded call fails with.
import { afterAll, beforeAll } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { inArray } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import type { Role } from '$lib/roles';
import type { BuildInput } from '$lib/schemas/build';

const tag = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 7)}`;

/** A fresh member with a unique e-mail and handle. → { id, role, name, handle } (an Actor for the builds module). */
export async function createTestUser(role: Role = 'maker', name = 'Build Tester') {
	const t = tag();
	const id = crypto.randomUUID();
	await db.insert(schema.user).values({
		id,
		name: `${name} ${t}`,
		email: `build-${t}@example.test`,
		emailVerified: true,
		handle: `bt${t}`,
		role
	});
	return { id, role, name: `${name} ${t}`, handle: `bt${t}` };
}

/** Remove test members; their builds, steps, revisions and audit rows go with them (cascades). */
export async function removeTestUsers(ids: string[]): Promise<void> {
	if (ids.length) await db.delete(schema.user).where(inArray(schema.user.id, ids));
}

/** A unique title, so slugs never depend on what else is in the database. */
export function uniqueTitle(base = 'Test chip amp'): string {
	return `${base} ${tag()}`;
}

export type TestUser = Awaited<ReturnType<typeof createTestUser>>;

/**
 * Throwaway members for one test file: made before its tests (in a `beforeAll` registered here, so before the
 * file's own), removed after them with everything they own. The returned members are filled in place, so they
 * can be destructured at the top of the file: `const { maker, admin } = useTestUsers({ maker: ['maker', 'Owner'], … })`.
 */
export function useTestUsers<K extends string>(spec: Record<K, [role: Role, name: string]>): Record<K, TestUser> {
	const keys = Object.keys(spec) as K[];
	const out = Object.fromEntries(keys.map((k) => [k, { id: '', role: spec[k][0], name: '', handle: '' }])) as Record<K, TestUser>;
	beforeAll(async () => {
		for (const k of keys) Object.assign(out[k], await createTestUser(spec[k][0], spec[k][1]));
	});
	afterAll(async () => {
		await removeTestUsers(keys.map((k) => out[k].id).filter(Boolean));
	});
	return out;
}

/** The fields of a new build: a mains-powered chip amplifier (`title` unique unless given). */
export function buildFields(title = uniqueTitle()): BuildInput {
	return {
		title,
		summary: 'Two monolithic power amplifier ICs on ±28 V rails.',
		category: 'power-amp',
		topology: 'class-ab-chip',
		mainsPowered: true,
		licence: 'CC-BY-SA-4.0'
	};
}

/** The HTTP status a call fails with (it must fail). */
export async function statusOf(p: Promise<unknown>): Promise<number> {
	try {
		await p;
	} catch (e) {
		if (isHttpError(e)) return e.status;
		throw e;
	}
	throw new Error('expected the call to fail');
}
