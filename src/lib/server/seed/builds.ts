import type { Tx } from '../db';
import * as schema from '../db/schema';
import type { DemoMemberKey } from './members';

/** Invented demo builds (drafts for now). */
export async function seedBuilds(tx: Tx, ids: Record<DemoMemberKey, string>): Promise<void> {
	await tx.insert(schema.build).values([
		{
			slug: 'bench-stereo-chip-amp',
			ownerId: ids.maker,
			title: 'Bench stereo chip amp on ±28 V rails',
			summary: 'Two 5-pin monolithic power amplifier ICs on a split supply, in a folded aluminium case.',
			category: 'power-amp',
			topology: 'class-ab-chip',
			mainsPowered: true
		},
		{
			slug: 'quiet-class-a-headphone-amp',
			ownerId: ids.maker2,
			title: 'Quiet class A headphone amp',
			summary: 'A discrete single-ended class A stage with a follower output, fed from a small linear supply.',
			category: 'headphone-amp',
			topology: 'class-a',
			mainsPowered: true
		},
		{
			slug: 'dual-rail-lab-supply',
			ownerId: ids.maker3,
			title: 'Dual-rail linear supply for amplifier boards',
			summary: 'Toroid, bridge and reservoirs for ±30 V rails, with bleeders and a soft start.',
			category: 'power-supply',
			topology: 'other',
			mainsPowered: true
		}
	]);
}
