// Integration tests against the real PostgreSQL of DATABASE_URL: notes on saved builds and the combined
// shopping list (parts as last published, only builds on the member's own bench).
import { describe, it, expect } from 'vitest';
import { useTestUsers } from './testing/builds';
import { statusOf, testBuild } from './testing/parts';
import { savePartsList } from './parts';
import { publishRevision } from './builds';
import { benchNotes, setBenchNote, setOnBench, shoppingList, BENCH_NOTE_MAX } from './bench';
import { emptyDraft, type PartLineDraft } from '$lib/parts';

const { maker, reader, other } = useTestUsers({ maker: ['maker', 'Bench maker'], reader: ['maker', 'Bench reader'], other: ['maker', 'Bench other'] });

const d = (over: Partial<PartLineDraft>): PartLineDraft => ({ ...emptyDraft(), ...over });

/** A published build with these parts (saved before publishing, so Rev A has them). */
async function withParts(parts: PartLineDraft[]) {
	const b = await testBuild(maker.id);
	const r = await savePartsList(maker, b.id, parts);
	if (!r.ok) throw new Error(JSON.stringify(r));
	const { addStep, publish } = await import('./builds');
	await addStep(maker, b.id, { title: 'Boards', bodyMd: 'Populate.' });
	await publish(maker, b.id);
	return b;
}

describe('bench notes', () => {
	it('keeps a note per saved build, only for builds on the bench', async () => {
		const b = await testBuild(maker.id, { published: true });
		expect(await statusOf(setBenchNote(reader.id, b.slug, 'Order the caps'))).toBe(404);
		await setOnBench(reader.id, b.slug, true);
		await setBenchNote(reader.id, b.slug, '  Order the caps from the\r\nlocal shop  ');
		expect((await benchNotes(reader.id)).get(b.id)).toBe('Order the caps from the\nlocal shop');
		expect((await benchNotes(other.id)).has(b.id)).toBe(false);
		expect(await statusOf(setBenchNote(reader.id, b.slug, 'x'.repeat(BENCH_NOTE_MAX + 1)))).toBe(422);
		await setBenchNote(reader.id, b.slug, '');
		expect((await benchNotes(reader.id)).has(b.id)).toBe(false);
	});
});

describe('shoppingList', () => {
	it('sums the published parts of the chosen bench builds; 4k7 and 4.7k together', async () => {
		const a = await withParts([d({ designators: 'R1, R2', quantity: '2', kind: 'resistor', value: '4k7', ratingW: '0.25' }), d({ designators: 'C1', kind: 'capacitor', value: '100n', ratingV: '63' })]);
		const b = await withParts([d({ designators: 'R5', quantity: '3', kind: 'resistor', value: '4.7k', ratingW: '0.25' })]);
		const notSaved = await withParts([d({ designators: 'R9', quantity: '7', kind: 'resistor', value: '4k7', ratingW: '0.25' })]);
		for (const x of [a, b]) await setOnBench(reader.id, x.slug, true);
		const list = await shoppingList(reader.id, [a.slug, b.slug, notSaved.slug]);
		expect(list.builds.map((x) => x.slug).sort()).toEqual([a.slug, b.slug].sort());
		expect(list.rows.map((r) => [r.kind, r.valueSI, r.quantity])).toEqual([
			['resistor', 4700, 5],
			['capacitor', 1e-7, 1]
		]);
		// Pending changes do not count until published.
		await savePartsList(maker, b.id, [d({ designators: 'R5', quantity: '10', kind: 'resistor', value: '4.7k', ratingW: '0.25' })]);
		expect((await shoppingList(reader.id, [a.slug, b.slug])).rows[0].quantity).toBe(5);
		await publishRevision(maker, b.id, 'More resistors');
		expect((await shoppingList(reader.id, [a.slug, b.slug])).rows[0].quantity).toBe(12);
		expect(await shoppingList(reader.id, [])).toEqual({ builds: [], rows: [] });
	});
});
