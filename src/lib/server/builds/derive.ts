/** Derive: take a published build's parts list and spec blocks as the start of your own draft. */
import { error } from '@sveltejs/kit';
import { asc, eq, sql } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';
import { TITLE_MAX, type BuildInput } from '$lib/schemas/build';
import type { Actor } from '../actor';
import { createDraft, lockBuild } from './edit';
import { refreshSearchText } from '../search';
import { inTx } from '../db/tx';

/** Title of a draft started from another build: the original's, marked, within TITLE_MAX. "Quiet class A amp" → "Quiet class A amp (my build)". */
export function derivedTitle(originTitle: string): string {
	const mark = ' (my build)';
	const room = TITLE_MAX - mark.length;
	const base = originTitle.length > room ? `${originTitle.slice(0, room - 1).trimEnd()}…` : originTitle;
	return `${base}${mark}`;
}

/**
 * Any signed-in member derives a published build: a new draft owned by them, with copies of the
 * origin's parts list and spec blocks (not its steps, text or photos), `derivedFromId` set and the
 * origin's `derivedCount` incremented — all in one transaction. `opts.title` names the draft (default:
 * the origin's title marked "(derived)"); the slug follows it. → { id, slug } of the new draft.
 */
export async function derive(
	actor: Actor,
	originId: string,
	tx?: Tx,
	opts: { title?: string } = {}
): Promise<{ id: string; slug: string }> {
	if (!actor?.id) error(401, 'Sign in first.');
	return inTx(tx, async (t) => {
		const origin = await lockBuild(t, originId);
		if (origin.status !== 'published') {
			error(origin.status === 'draft' ? 404 : 409, origin.status === 'draft' ? 'Not found' : 'Only a published build can be started from.');
		}
		const input: BuildInput = {
			title: opts.title ?? derivedTitle(origin.title),
			summary: '',
			category: origin.category as BuildInput['category'],
			topology: origin.topology as BuildInput['topology'],
			mainsPowered: origin.mainsPowered,
			licence: origin.licence as BuildInput['licence']
		};
		const created = await createDraft(actor.id, input, t, { derivedFromId: origin.id });

		const blocks = await t
			.select()
			.from(schema.specBlock)
			.where(eq(schema.specBlock.buildId, origin.id))
			.orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt));
		if (blocks.length) {
			await t.insert(schema.specBlock).values(
				blocks.map((b) => ({
					buildId: created.id,
					kind: b.kind,
					title: b.title,
					data: b.data,
					derived: b.derived,
					checks: b.checks,
					position: b.position
				}))
			);
		}
		const parts = await t
			.select()
			.from(schema.partLine)
			.where(eq(schema.partLine.buildId, origin.id))
			.orderBy(asc(schema.partLine.position));
		if (parts.length) {
			await t.insert(schema.partLine).values(
				// eslint-disable-next-line @typescript-eslint/no-unused-vars
				parts.map(({ id, buildId, ...rest }) => ({ ...rest, buildId: created.id }))
			);
		}
		await t
			.update(schema.build)
			.set({ derivedCount: sql`${schema.build.derivedCount} + 1` })
			.where(eq(schema.build.id, origin.id));
		await refreshSearchText(t, created.id);
		return created;
	});
}
