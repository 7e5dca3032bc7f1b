// Integration-test helpers for review, flags, comments and moderation: a published build with a heatsink
// step, a supply spec block and a parts list, made through the real domain modules.
import { actorOf } from '../actor';
import { eq, sql } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db } from '../db';
import { addStep, createDraft, publish } from '../builds';
import { saveSpecBlock } from '../specs';
import { savePartsList } from '../parts';
import { emptyDraft } from '$lib/parts';
import { buildFields, uniqueTitle } from './builds';
import { supplyBlock } from '$lib/specs/fixtures';

/** Supply block data that passes its schema and fires no check (the shared fixture of $lib/specs/fixtures). */
export const SUPPLY_DATA = supplyBlock();

export interface TestBuild {
	id: string;
	slug: string;
	title: string;
	steps: { heatsink: string; wiring: string };
	supplyBlockId: string;
}

/**
 * A published, mains-powered chip-amp build owned by `owner`: two steps (wiring, heatsink), a supply
 * block and a two-line parts list. Made through the builds, specs and parts modules, so it is r1+ as
 * a maker would leave it.
 */
export async function createPublishedBuild(owner: { id: string; role?: string }, title = uniqueTitle('Review test amp')): Promise<TestBuild> {
	const actor = actorOf(owner);
	const { id, slug } = await createDraft(owner.id, { ...buildFields(title), summary: 'A stereo chip amp for review tests.' });
	const wiring = await addStep(actor, id, { title: 'Mains inlet and fuse', bodyMd: 'Fused IEC inlet, earth to the chassis stud.' });
	const heatsink = await addStep(actor, id, { title: 'Heatsink and mounting', bodyMd: 'The tab sits at V−; mica and grease under it.' });
	const block = await saveSpecBlock(actor, id, { kind: 'supply', title: 'Main supply', data: SUPPLY_DATA });
	if (!block.ok) throw new Error(`supply block refused: ${JSON.stringify(block.issues)}`);
	const line = (over: Partial<ReturnType<typeof emptyDraft>>) => ({ ...emptyDraft(), ...over });
	const parts = await savePartsList(actor, id, [
		line({ designators: 'C1, C2', quantity: '2', kind: 'capacitor', value: '10000u', ratingV: '50' }),
		line({ designators: 'R1', quantity: '1', kind: 'resistor', value: '22k' })
	]);
	if (!parts.ok) throw new Error(`parts refused: ${JSON.stringify(parts.errors)}`);
	await publish(actor, id);
	return { id, slug, title, steps: { heatsink: heatsink.id, wiring: wiring.id }, supplyBlockId: block.id };
}

/** Mail jobs queued (not yet sent or sent) for an address since `since`, read from pg-boss's table. */
export async function queuedMailTo(email: string, since: Date): Promise<{ subject: string }[]> {
	const rows = await db.execute<{ subject: string }>(
		sql`select data->>'subject' as subject from pgboss.job where name = 'mail' and data->>'to' = ${email} and created_on >= ${since.toISOString()}::timestamptz order by created_on`
	);
	return [...rows];
}

/** A member's e-mail address. */
export async function emailOf(id: string): Promise<string> {
	const [u] = await db.select({ email: schema.user.email }).from(schema.user).where(eq(schema.user.id, id));
	return u.email;
}
