// Integration-test helpers for parts lists and spec blocks: a draft or published build of a fresh member,
// valid block data of each kind, and the HTTP status a guarded call fails with.
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { addStep, createDraft, publish } from '../builds';
import { buildFields, uniqueTitle } from './builds';

/** A draft build of `ownerId` (published with one step when asked). → its row. */
export async function testBuild(ownerId: string, { published = false } = {}): Promise<schema.Build> {
	const { id } = await createDraft(ownerId, { ...buildFields(uniqueTitle('Parts test amp')), summary: 'Two monolithic power amplifier ICs on a split supply.' });
	if (published) {
		const actor = { id: ownerId, role: 'maker' as const };
		await addStep(actor, id, { title: 'Boards', bodyMd: 'Populate the boards.' });
		await publish(actor, id);
	}
	const [row] = await db.select().from(schema.build).where(eq(schema.build.id, id));
	return row;
}

export { statusOf } from './builds';

import { supplyBlock } from '$lib/specs/fixtures';

/** A valid amplifier block: ±28 V into 8 Ω, device max 60 V. */
export const AMP = {
	channels: 2,
	topology: 'class-ab-chip',
	supply: 'split',
	railV: 28,
	loadOhm: 8,
	device: { maxSupplyV: 60, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 },
	gain: { rfOhm: 22000, riOhm: 680 },
	claimed: { powerW: 35, thdPct: 1 }
};

/**
 * A valid supply block (the shared fixture with a smaller transformer): 20 V secondaries, bridge-split, 0.7 V drops,
 * 10 % regulation assumed → 27.6 V per rail at full load, 33.5 V off load at +10 % mains; 50 V caps, fused and earthed.
 */
export const SUPPLY = supplyBlock({
	transformerVA: 160,
	secondaryVac: 20,
	diodeDropV: undefined,
	regulationPct: undefined,
	capRatingV: 50,
	loadCurrentA: 1.5,
	fuse: { ratingA: 1.6, type: 'slow' },
	bleeder: { ohm: 2200 }
});
