/**
 * Stored check results follow the rules in force: when the checks change (revision 2 added worst-case figures,
 * rectifier currents, new ids), blocks and parts lists saved under older rules still hold the old derived values and
 * checks. recheckStoredBuilds() recomputes every build that has spec blocks or part lines with the one function the
 * saves use (refreshBuildChecks → $lib/specs checkBuild), so the build page, review mode, the review desk and the
 * API read what checkBuild returns now. It writes only rows whose result changed, never makes a revision and never
 * touches "edited since sign-off": the maker's content is unchanged, only what is computed from it.
 * Run at app start (startup.ts; RECHECK_ON_START=off skips it).
 */
import { and, asc, eq, gt, or, sql } from 'drizzle-orm';
import * as schema from './db/schema';
import { db } from './db';
import { inTx } from './db/tx';
import { refreshBuildChecks } from './parts/checks';

/** Builds per page of the walk over the build table. */
const PAGE = 200;

/**
 * Recompute the stored checks of every build with spec blocks or part lines, one transaction per build with the
 * build row locked (a save in progress finishes first; a save after it recomputes anyway). → how many builds were
 * looked at. recheckStoredBuilds() → { builds: 6 } on the demo scenario.
 */
export async function recheckStoredBuilds(): Promise<{ builds: number }> {
	let after: string | null = null;
	let builds = 0;
	const hasContent = or(
		sql`exists (select 1 from ${schema.specBlock} where ${schema.specBlock.buildId} = ${schema.build.id})`,
		sql`exists (select 1 from ${schema.partLine} where ${schema.partLine.buildId} = ${schema.build.id})`
	);
	for (;;) {
		const page: { id: string }[] = await db
			.select({ id: schema.build.id })
			.from(schema.build)
			.where(after ? and(gt(schema.build.id, after), hasContent) : hasContent)
			.orderBy(asc(schema.build.id))
			.limit(PAGE);
		for (const { id } of page) {
			await inTx(undefined, async (t) => {
				const [b] = await t.select({ id: schema.build.id }).from(schema.build).where(eq(schema.build.id, id)).for('update');
				if (b) await refreshBuildChecks(t, id);
			});
			builds++;
		}
		if (page.length < PAGE) break;
		after = page[page.length - 1].id;
	}
	return { builds };
}
