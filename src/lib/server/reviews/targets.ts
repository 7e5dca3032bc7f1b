/** What a safety flag points at: a step, a spec block or a part line of the same build. */
import { and, asc, eq } from 'drizzle-orm';
import { error } from '@sveltejs/kit';
import * as schema from '../db/schema';
import { db } from '../db';
import type { DbLike } from '../db/tx';
import type { FlagTargetKind } from '$lib/reviews';
import { KIND_LABELS } from '$lib/components/specs/display';

export interface FlagTarget {
	kind: FlagTargetKind;
	id: string;
	/** "step 3 “Heatsink and mounting”", "spec block Power supply", "part line C1, C2 (10000u capacitor)". */
	label: string;
	/** Fragment on the build page that shows the target. */
	anchor: string;
}

function partLabel(p: Pick<schema.PartLine, 'designators' | 'valueText' | 'kind'>): string {
	const what = [p.valueText, p.kind].filter(Boolean).join(' ');
	return `part line ${p.designators || '(no designator)'}${what ? ` (${what})` : ''}`;
}

function specLabel(s: Pick<schema.SpecBlock, 'kind' | 'title'>): string {
	return `spec block ${s.title || KIND_LABELS[s.kind] || s.kind}`;
}

/**
 * Every flaggable target of a build, keyed by id (steps numbered as on the page). One query per kind;
 * used for labels in lists and to check that a flag's target belongs to the build.
 */
export async function loadTargets(buildId: string, dbx: DbLike = db): Promise<Map<string, FlagTarget>> {
	const [steps, specs, parts] = await Promise.all([
		dbx
			.select({ id: schema.buildStep.id, title: schema.buildStep.title })
			.from(schema.buildStep)
			.where(eq(schema.buildStep.buildId, buildId))
			.orderBy(asc(schema.buildStep.position), asc(schema.buildStep.createdAt)),
		dbx
			.select({ id: schema.specBlock.id, kind: schema.specBlock.kind, title: schema.specBlock.title })
			.from(schema.specBlock)
			.where(eq(schema.specBlock.buildId, buildId)),
		dbx
			.select({
				id: schema.partLine.id,
				designators: schema.partLine.designators,
				valueText: schema.partLine.valueText,
				kind: schema.partLine.kind
			})
			.from(schema.partLine)
			.where(eq(schema.partLine.buildId, buildId))
	]);
	const out = new Map<string, FlagTarget>();
	steps.forEach((s, i) =>
		out.set(s.id, { kind: 'step', id: s.id, label: `step ${i + 1} “${s.title}”`, anchor: `#step-${i + 1}` })
	);
	for (const s of specs) out.set(s.id, { kind: 'spec', id: s.id, label: specLabel(s), anchor: `#spec-${s.id}-h` });
	for (const p of parts) out.set(p.id, { kind: 'part', id: p.id, label: partLabel(p), anchor: `#part-${p.id}` });
	return out;
}

/** The target if it exists in this build with this kind; 422 otherwise (a stale form or a forged id). */
export async function requireTarget(dbx: DbLike, buildId: string, kind: FlagTargetKind, id: string): Promise<FlagTarget> {
	const table = kind === 'step' ? schema.buildStep : kind === 'spec' ? schema.specBlock : schema.partLine;
	const [row] = await dbx
		.select({ id: table.id })
		.from(table)
		.where(and(eq(table.id, id), eq(table.buildId, buildId)));
	if (!row) error(422, 'That step, spec block or part line is not part of this build (any more). Reload the page.');
	const targets = await loadTargets(buildId, dbx);
	return targets.get(id) ?? { kind, id, label: kind, anchor: '' };
}

/** Shown for a flag whose target was deleted since. */
export function missingTarget(kind: string, id: string): FlagTarget {
	const what = kind === 'step' ? 'a step' : kind === 'spec' ? 'a spec block' : 'a part line';
	return { kind: kind as FlagTargetKind, id, label: `${what} since removed`, anchor: '' };
}
