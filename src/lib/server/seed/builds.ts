import { and, eq } from 'drizzle-orm';
import type { Tx } from '../db';
import * as schema from '../db/schema';
import { createDraft, addStep, publish, publishRevision, derive } from '../builds';
import { savePartsList } from '../parts';
import { saveSpecBlock } from '../specs';
import { processAndStorePhoto, renderIllustration } from '../photos';
import { renderMarkdown } from '../markdown';
import { CHECKLIST_KEYS, checklistFromTicked } from '$lib/review-checklist';
import { emptyDraft } from '$lib/parts';
import { DEMO_MEMBERS, type DemoMemberKey } from './members';
import { DEMO_BUILDS, DEMO_DERIVE, type DemoBuild } from './content';
import { illustrationSvg } from './illustrations';

type Ids = Record<DemoMemberKey, string>;

const roleOf = (key: DemoMemberKey) => DEMO_MEMBERS.find((m) => m.key === key)!.role;

interface Seeded {
	demo: DemoBuild;
	id: string;
	ownerId: string;
	stepIds: string[];
}

/**
 * The invented demo builds, written through the same domain functions the pages use, so every spec
 * block carries its derived values and checks and every published build has its revisions. Runs in
 * the seed's transaction; photos are drawn and stored in the same transaction too.
 */
export async function seedBuilds(tx: Tx, ids: Ids): Promise<void> {
	const seeded: Seeded[] = [];
	for (const demo of DEMO_BUILDS) {
		const ownerId = ids[demo.owner];
		const actor = { id: ownerId, role: roleOf(demo.owner) };
		const { id } = await createDraft(
			ownerId,
			{
				title: demo.title,
				summary: demo.summary,
				category: demo.category,
				topology: demo.topology,
				mainsPowered: demo.mainsPowered,
				licence: demo.licence
			} as Parameters<typeof createDraft>[1],
			tx
		);
		await tx.update(schema.build).set({ slug: demo.slug }).where(eq(schema.build.id, id));
		const stepIds: string[] = [];
		for (const s of demo.steps) stepIds.push((await addStep(actor, id, { title: s.title, bodyMd: s.body }, tx)).id);
		for (const block of demo.specs) {
			const r = await saveSpecBlock(actor, id, { kind: block.kind, data: block.data }, tx);
			if (!r.ok) throw new Error(`demo spec block ${demo.key}/${block.kind}: ${JSON.stringify(r.issues)}`);
		}
		if (demo.parts.length) {
			const drafts = demo.parts.map((p) => ({
				...emptyDraft(),
				designators: p.designators,
				quantity: String(p.quantity),
				kind: p.kind,
				value: p.value,
				tolerance: p.tolerancePct != null ? String(p.tolerancePct) : '',
				ratingV: p.ratingV != null ? String(p.ratingV) : '',
				ratingW: p.ratingW != null ? String(p.ratingW) : '',
				package: p.package ?? '',
				notes: p.notes ?? '',
				designValue: p.designValue ?? '',
				reason: p.reason ?? ''
			}));
			const r = await savePartsList(actor, id, drafts, { tx });
			if (!r.ok) throw new Error(`demo parts ${demo.key}: ${JSON.stringify(r.errors)}`);
		}
		await seedPhotos(tx, demo, id, ownerId, stepIds);
		if (demo.status === 'published') await publish(actor, id, tx);
		seeded.push({ demo, id, ownerId, stepIds });
	}
	await seedReviews(tx, ids, seeded);
	await seedConversation(tx, ids, seeded);
	const origin = seeded.find((s) => s.demo.key === DEMO_DERIVE.from)!;
	await derive({ id: ids[DEMO_DERIVE.by], role: roleOf(DEMO_DERIVE.by) }, origin.id, tx, { title: DEMO_DERIVE.title });
}

async function seedPhotos(tx: Tx, demo: DemoBuild, buildId: string, ownerId: string, stepIds: string[]) {
	let seed = demo.slug.length;
	if (demo.cover) {
		const bytes = await renderIllustration(illustrationSvg(demo.cover.motif, '', seed++));
		await processAndStorePhoto({ ownerId, buildId, bytes, alt: demo.cover.alt, asCover: true, tx });
	}
	for (const [i, step] of demo.steps.entries()) {
		if (!step.image) continue;
		const bytes = await renderIllustration(illustrationSvg(step.image.motif, step.title, seed++));
		await processAndStorePhoto({ ownerId, buildId, stepId: stepIds[i], bytes, alt: step.image.alt, tx });
	}
}

/** Reviews in each state the scenario needs: signed off, sent back with hazard tags, waiting, edited since sign-off. */
async function seedReviews(tx: Tx, ids: Ids, seeded: Seeded[]) {
	const reviewer = ids.reviewer;
	const day = 24 * 3600 * 1000;
	for (const [n, s] of seeded.entries()) {
		const kind = s.demo.review;
		if (!kind) continue;
		const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, s.id));
		const at = new Date(Date.now() - (10 - n) * day);
		if (kind === 'waiting') {
			await tx.update(schema.build).set({ reviewRequestedAt: at }).where(eq(schema.build.id, s.id));
			continue;
		}
		const verdict = kind === 'rework' ? 'rework' : 'safe';
		const summary =
			verdict === 'safe'
				? 'Earthing, fusing and the insulated tabs look right to me, and the heatsinks have margin at 40 °C. This is my opinion as a peer, not a certification.'
				: 'Two things to change before this stays on for long: the output transistors run close to their limit on those small heatsinks, and the output resistor was replaced by a link.';
		await tx.insert(schema.review).values({
			buildId: s.id,
			reviewerId: reviewer,
			revision: b.revision,
			verdict,
			summaryMd: summary,
			summaryHtml: renderMarkdown(summary),
			// A mains sign-off carries the ticked review checklist ($lib/review-checklist).
			checklist: b.mainsPowered ? checklistFromTicked(verdict === 'safe' ? CHECKLIST_KEYS : ['pe-continuity', 'live-fuse']) : [],
			createdAt: at
		});
		await tx.update(schema.build).set({ lastReviewedAt: at }).where(eq(schema.build.id, s.id));
		if (kind === 'rework') {
			const [thermal] = await tx
				.select()
				.from(schema.specBlock)
				.where(and(eq(schema.specBlock.buildId, s.id), eq(schema.specBlock.kind, 'thermal')));
			const parts = await tx.select().from(schema.partLine).where(eq(schema.partLine.buildId, s.id));
			const link = parts.find((p) => p.kind === 'resistor' && p.valueText.startsWith('0R'));
			const flags = [
				{ targetKind: 'step', targetId: s.stepIds[1], category: 'heat', severity: 'fix', note: 'About 138 °C at the junction with a 45 °C case inside. Use a larger heatsink (≤ 6 K/W) or lower the idle current.' },
				...(link ? [{ targetKind: 'part', targetId: link.id, category: 'ratings', severity: 'check', note: 'The link removes the output protection resistor; a shorted jack now loads the follower directly.' }] : []),
				...(thermal ? [{ targetKind: 'spec', targetId: thermal.id, category: 'heat', severity: 'fix', note: 'Please re-run this block with the heatsink you end up using.' }] : [])
			];
			for (const f of flags) {
				await tx.insert(schema.safetyFlag).values({
					buildId: s.id,
					raisedById: reviewer,
					targetKind: f.targetKind,
					targetId: f.targetId,
					category: f.category,
					severity: f.severity,
					noteMd: f.note,
					noteHtml: renderMarkdown(f.note),
					revision: b.revision,
					createdAt: at
				});
			}
		}
		if (kind === 'safe-changed') {
			// The maker edited the build after the sign-off and published it as Rev B, so the stamp reads
			// "Edited since sign-off at Rev A".
			const maker = { id: s.ownerId, role: 'maker' as const };
			await addStep(maker, s.id, {
				title: 'Later: a soft-start for the toroid',
				bodyMd: 'I added an inrush limiter (a thermistor shorted by a relay after two seconds). The fuse no longer flickers at switch-on.'
			}, tx);
			await publishRevision(maker, s.id, 'Soft-start for the toroid added.', tx);
		}
	}
}

/** A few comments with a reply, and open reports so the moderation desk has work in the demo. */
async function seedConversation(tx: Tx, ids: Ids, seeded: Seeded[]) {
	const chipamp = seeded.find((s) => s.demo.key === 'chipamp')!;
	const headphone = seeded.find((s) => s.demo.key === 'headphone')!;
	const hour = 3600 * 1000;
	const say = async (buildId: string, authorId: string, body: string, hoursAgo: number, parentId: string | null = null) => {
		const [row] = await tx
			.insert(schema.comment)
			.values({ buildId, authorId, parentId, bodyMd: body, bodyHtml: renderMarkdown(body), createdAt: new Date(Date.now() - hoursAgo * hour) })
			.returning({ id: schema.comment.id });
		return row.id;
	};
	const q = await say(chipamp.id, ids.maker2, 'How warm do the heatsinks get after an hour at a loud listening level?', 50);
	await say(chipamp.id, ids.maker, 'About 45 °C at the fins with the lid on — the bring-up block has the heat-soak figure.', 48, q);
	await say(chipamp.id, ids.reviewer2, 'Nice work on the insulated tabs. Did you measure the mica washers with a meter before the first power-up?', 30);
	// An invented account that only posts an advertisement (it has no password: nobody signs in as it).
	const spammerId = crypto.randomUUID();
	await tx.insert(schema.user).values({ id: spammerId, name: 'Parts Bargains', email: 'bargains@starground.test', emailVerified: true, handle: 'parts-bargains', role: 'maker' });
	const spam = await say(headphone.id, spammerId, 'Cheap boards and parts, best prices, message me for a link!!!', 5);
	await tx.insert(schema.report).values([
		{ reporterId: ids.maker2, targetKind: 'comment', targetId: spam, reason: 'Advertising, nothing to do with the build.', createdAt: new Date(Date.now() - 4 * hour) },
		{ reporterId: ids.maker, targetKind: 'build', targetId: seeded.find((s) => s.demo.key === 'supply')!.id, reason: 'Metal case on a two-pin inlet with no earth: please lock it until the maker fixes it.', createdAt: new Date(Date.now() - 2 * hour) }
	]);
}
