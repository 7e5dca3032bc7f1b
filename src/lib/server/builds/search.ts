import { asc, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';

/** Longest search text kept per build, in characters (the tsvector has a 1 MB limit; this is far below it). */
const SEARCH_TEXT_MAX = 200_000;

/**
 * Rebuild `build.search_text` (step titles and text, spec-block titles, parts-list values and notes) in
 * the caller's transaction. The generated `search` tsvector follows it. Call after every save that
 * touches steps or parts; the parts editor calls it too.
 */
export async function refreshSearchText(tx: Tx, buildId: string): Promise<void> {
	const [steps, parts, blocks] = await Promise.all([
		tx
			.select({ title: schema.buildStep.title, bodyMd: schema.buildStep.bodyMd })
			.from(schema.buildStep)
			.where(eq(schema.buildStep.buildId, buildId))
			.orderBy(asc(schema.buildStep.position)),
		tx
			.select({
				designators: schema.partLine.designators,
				kind: schema.partLine.kind,
				valueText: schema.partLine.valueText,
				designValueText: schema.partLine.designValueText,
				package: schema.partLine.package,
				notes: schema.partLine.notes,
				substitutionReason: schema.partLine.substitutionReason
			})
			.from(schema.partLine)
			.where(eq(schema.partLine.buildId, buildId))
			.orderBy(asc(schema.partLine.position)),
		tx.select({ title: schema.specBlock.title }).from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId))
	]);
	const text = [
		...steps.map((s) => `${s.title}\n${s.bodyMd}`),
		...blocks.map((b) => b.title),
		...parts.map((p) =>
			[p.designators, p.kind, p.valueText, p.designValueText, p.package, p.notes, p.substitutionReason]
				.filter(Boolean)
				.join(' ')
		)
	]
		.filter(Boolean)
		.join('\n')
		.slice(0, SEARCH_TEXT_MAX);
	await tx.update(schema.build).set({ searchText: text }).where(eq(schema.build.id, buildId));
}
