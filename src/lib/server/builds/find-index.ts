/**
 * Find builds by their numbers: the find index (tables `published_figure` and `published_part`) and the
 * list conditions over it. The index holds what the LATEST PUBLISHED REVISION of a build says — never
 * pending changes — and is rewritten from that revision's snapshot in the transaction that records the
 * revision (createRevision: first publish, "publish changes", the demo seed). One SQL statement per table
 * builds the rows from the snapshot's JSON, so a whole database can be (re)filled the same way
 * (`refreshFindIndex(dbx, null)`, e.g. after a bulk load).
 *
 * Figures, one row per amplifier or supply block:
 * - rail_v: volts on EACH SIDE — an amplifier's `railV` (a single supply counts as half its total), a supply's
 *   loaded rail `averageDcV` (halved for a one-rail rectifier);
 * - load_ohm: an amplifier's nominal `loadOhm`;
 * - power_w: an amplifier's claimed power per channel, else what its rails allow (`maxPowerW`).
 * Parts, one row per parts line: kind, SI value (Ω, F, H — the parts module's normalised reading, so `0R22`,
 * `0.22` and `220m` are one value), the value text and package in lower case.
 *
 * The list conditions (queries named for the benchmark): `find.figures` (rail/load/power on one block)
 * and `find.part` (kind + value, or value text, and/or package on one line) — each an EXISTS on one index.
 */
import { sql, type SQL } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { DbLike } from '../db/tx';

/** A JSON number as float8, or null when the value is missing or not a number. */
const num = (j: SQL) => sql`(case when jsonb_typeof(${j}) = 'number' then (${j})::float8 end)`;
/** Text as a key: trimmed, runs of white space made one space, lower case. */
const key = (t: SQL) => sql`lower(regexp_replace(btrim(coalesce(${t}, '')), '\\s+', ' ', 'g'))`;
/** A JSON array, or an empty one. */
const arr = (j: SQL) => sql`(case when jsonb_typeof(${j}) = 'array' then ${j} else '[]'::jsonb end)`;

/**
 * Rewrite the find index of one build (`buildId`) or of every build (null) from its latest published
 * revision. Builds without a revision get no rows. Run it inside the transaction that changed the revision.
 */
export async function refreshFindIndex(dbx: DbLike, buildId: string | null): Promise<void> {
	const only = (col: SQL) => (buildId ? sql`${col} = ${buildId}::uuid` : sql`true`);
	await dbx.execute(sql`delete from ${schema.publishedFigure} where ${only(sql`build_id`)}`);
	await dbx.execute(sql`delete from ${schema.publishedPart} where ${only(sql`build_id`)}`);
	const blk = sql`e.blk`;
	const data = sql`${blk}->'data'`;
	const derived = sql`${blk}->'derived'`;
	await dbx.execute(sql`
		insert into ${schema.publishedFigure} (build_id, block, kind, rail_v, load_ohm, power_w)
		select b.id, e.ord::int - 1, ${blk}->>'kind',
			case when ${blk}->>'kind' = 'amplifier'
				then ${num(sql`${data}->'railV'`)} / (case when ${data}->>'supply' = 'single' then 2 else 1 end)
				else ${num(sql`${derived}->'averageDcV'`)} / (case when ${num(sql`${derived}->'railCount'`)} = 2 then 1 else 2 end)
			end,
			case when ${blk}->>'kind' = 'amplifier' then ${num(sql`${data}->'loadOhm'`)} end,
			case when ${blk}->>'kind' = 'amplifier' then coalesce(${num(sql`${data}->'claimed'->'powerW'`)}, ${num(sql`${derived}->'maxPowerW'`)}) end
		from ${schema.build} b
		join ${schema.buildRevision} r on r.build_id = b.id and r.number = b.revision
		cross join lateral jsonb_array_elements(${arr(sql`r.snapshot->'specBlocks'`)}) with ordinality e(blk, ord)
		where ${only(sql`b.id`)} and b.revision > 0 and ${blk}->>'kind' in ('amplifier', 'supply')`);
	await dbx.execute(sql`
		insert into ${schema.publishedPart} (build_id, line, kind, value, value_key, package_key)
		select b.id, e.ord::int - 1, coalesce(e.p->>'kind', 'other'), ${num(sql`e.p->'value'`)},
			${key(sql`e.p->>'valueText'`)}, ${key(sql`e.p->>'package'`)}
		from ${schema.build} b
		join ${schema.buildRevision} r on r.build_id = b.id and r.number = b.revision
		cross join lateral jsonb_array_elements(${arr(sql`r.snapshot->'parts'`)}) with ordinality e(p, ord)
		where ${only(sql`b.id`)} and b.revision > 0 and jsonb_typeof(e.p) = 'object'`);
}

/** Relative slack when matching a stored float to a typed value (0.22 vs 220 × 0.001 = 0.22000000000000003). */
export const MATCH_SLACK = 1e-9;

/** The numbers a list may be narrowed to (each optional; those given must hold for ONE block). */
export interface FigureFilter {
	railMinV?: number;
	railMaxV?: number;
	loadOhm?: number;
	powerMinW?: number;
	powerMaxW?: number;
}

/** A part a list may be narrowed to (those given must hold for ONE line). */
export interface PartFilter {
	kind?: string;
	/** SI value (for kinds with one), matched within MATCH_SLACK. */
	value?: number;
	/** Value text for kinds without an SI value, matched as a key (case and spacing ignored). */
	valueText?: string;
	package?: string;
}

const near = (col: SQL, v: number) => {
	const a = v * (1 - MATCH_SLACK);
	const b = v * (1 + MATCH_SLACK);
	return sql`${col} between ${Math.min(a, b)} and ${Math.max(a, b)}`;
};
const textKey = (t: string) => t.trim().replace(/\s+/g, ' ').toLowerCase();

/** `find.figures`: EXISTS a block of the build whose rail, load and power are in the asked ranges; null when nothing asked. */
export function figureCondition(buildId: SQL | typeof schema.build.id, f: FigureFilter): SQL | null {
	const c: SQL[] = [];
	if (f.railMinV !== undefined) c.push(sql`f.rail_v >= ${f.railMinV}`);
	if (f.railMaxV !== undefined) c.push(sql`f.rail_v <= ${f.railMaxV}`);
	if (f.loadOhm !== undefined) c.push(near(sql`f.load_ohm`, f.loadOhm));
	if (f.powerMinW !== undefined) c.push(sql`f.power_w >= ${f.powerMinW}`);
	if (f.powerMaxW !== undefined) c.push(sql`f.power_w <= ${f.powerMaxW}`);
	if (!c.length) return null;
	return sql`exists (select 1 from ${schema.publishedFigure} f where f.build_id = ${buildId} and ${sql.join(c, sql` and `)})`;
}

/** `find.part`: EXISTS a parts line of the build of that kind, value and package; null when nothing asked. */
export function partCondition(buildId: SQL | typeof schema.build.id, p: PartFilter): SQL | null {
	const c: SQL[] = [];
	if (p.kind) c.push(sql`p.kind = ${p.kind}`);
	if (p.value !== undefined) c.push(near(sql`p.value`, p.value));
	if (p.valueText) c.push(sql`p.value_key = ${textKey(p.valueText)}`);
	if (p.package) c.push(sql`p.package_key = ${textKey(p.package)}`);
	if (!c.length) return null;
	return sql`exists (select 1 from ${schema.publishedPart} p where p.build_id = ${buildId} and ${sql.join(c, sql` and `)})`;
}
