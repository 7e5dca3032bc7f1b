import { describe, it, expect } from 'vitest';
import { diffSnapshots, partLineOfSnapshot, snapshotPart, summarize, stableJson, type BuildSnapshot, type SnapshotPart, type SnapshotStep } from './snapshot';

function step(id: string, title: string, bodyMd = '', photoIds: string[] = []): SnapshotStep {
	return { id, title, bodyMd, bodyHtml: `<p>${bodyMd}</p>`, photoIds };
}

function part(id: string, designators: string, valueText: string, extra: Partial<SnapshotPart> = {}): SnapshotPart {
	return {
		id,
		designators,
		quantity: 1,
		kind: 'resistor',
		valueText,
		value: null,
		unit: 'ohm',
		tolerancePct: 1,
		ratingV: null,
		ratingW: 0.25,
		package: 'axial',
		notes: '',
		designValueText: null,
		designValue: null,
		substitutionReason: null,
		deviationPct: null,
		...extra
	};
}

function snap(over: Partial<BuildSnapshot> = {}, build: Partial<BuildSnapshot['build']> = {}): BuildSnapshot {
	return {
		version: 1,
		build: {
			title: 'Bench chip amp',
			summary: 'Two channels.',
			category: 'power-amp',
			topology: 'class-ab-chip',
			mainsPowered: true,
			licence: 'CC-BY-SA-4.0',
			coverPhotoId: null,
			...build
		},
		steps: [step('s1', 'Board'), step('s2', 'Chassis'), step('s3', 'Bring-up')],
		specBlocks: [{ id: 'b1', kind: 'supply', title: 'Rails', data: { mainsVac: 230 }, derived: {}, checks: [] }],
		parts: [part('p1', 'R1', '4k7'), part('p2', 'R2', '22k')],
		...over
	};
}

describe('diffSnapshots', () => {
	it('finds nothing between equal snapshots', () => {
		expect(diffSnapshots(snap(), snap())).toEqual([]);
	});

	it('summarises the example from the issue', () => {
		const a = snap();
		const b = snap(
			{
				steps: [step('s1', 'Board', 'new text'), step('s2', 'Chassis wiring'), step('s3', 'Bring-up')],
				parts: [...a.parts, part('p3', 'C1', '100n', { kind: 'capacitor' })]
			},
			{ title: 'Bench chip amp, rev B' }
		);
		expect(diffSnapshots(a, b)).toEqual(['2 steps changed', 'title changed', 'parts: 1 added']);
		expect(summarize(a, b)).toBe('2 steps changed, title changed, parts: 1 added');
	});

	it('counts added and removed steps and notices reordering', () => {
		const a = snap();
		const b = snap({ steps: [step('s3', 'Bring-up'), step('s1', 'Board'), step('s4', 'Listening')] });
		expect(diffSnapshots(a, b)).toEqual(['1 step added', '1 step removed', 'steps reordered']);
	});

	it('reports a swap of two steps as a reorder only', () => {
		const a = snap();
		const b = snap({ steps: [step('s2', 'Chassis'), step('s1', 'Board'), step('s3', 'Bring-up')] });
		expect(diffSnapshots(a, b)).toEqual(['steps reordered']);
	});

	it('names each changed build field', () => {
		const b = snap({}, { summary: 'x', category: 'preamp', mainsPowered: false, licence: 'CC0-1.0', coverPhotoId: 'ph1' });
		expect(diffSnapshots(snap(), b)).toEqual([
			'summary changed',
			'category changed',
			'mains powered changed',
			'licence changed',
			'cover photo changed'
		]);
	});

	it('counts photos added to and removed from steps', () => {
		const a = snap({ steps: [step('s1', 'Board', '', ['x', 'y'])] });
		const b = snap({ steps: [step('s1', 'Board', '', ['y', 'z', 'w'])] });
		expect(diffSnapshots(a, b)).toEqual(['photos: 2 added, 1 removed']);
	});

	it('treats a parts list saved by delete-and-insert (new ids, same content) as unchanged', () => {
		const a = snap();
		const b = snap({ parts: [part('n1', 'R1', '4k7'), part('n2', 'R2', '22k')] });
		expect(diffSnapshots(a, b)).toEqual([]);
	});

	it('matches re-inserted lines by designators, so an edited value reads as changed', () => {
		const a = snap();
		const b = snap({ parts: [part('n1', 'R1', '4k7'), part('n2', 'R2', '20k'), part('n3', 'R3', '1k')] });
		expect(diffSnapshots(a, b)).toEqual(['parts: 1 added, 1 changed']);
	});

	it('reports spec block edits and removals', () => {
		const a = snap({
			specBlocks: [
				{ id: 'b1', kind: 'supply', title: 'Rails', data: { mainsVac: 230 }, derived: {}, checks: [] },
				{ id: 'b2', kind: 'thermal', title: '', data: { ambientC: 40 }, derived: {}, checks: [] }
			]
		});
		const b = snap({ specBlocks: [{ id: 'b1', kind: 'supply', title: 'Rails', data: { mainsVac: 240 }, derived: {}, checks: [] }] });
		expect(diffSnapshots(a, b)).toEqual(['spec blocks: 1 changed, 1 removed']);
	});
});

describe('summarize', () => {
	it('calls the first revision "first published"', () => {
		expect(summarize(null, snap())).toBe('first published');
	});
	it('says when nothing visible changed', () => {
		expect(summarize(snap(), snap())).toBe('no visible changes');
	});
});

describe('stableJson', () => {
	it('ignores key order (jsonb stores keys in its own order)', () => {
		expect(stableJson({ b: 1, a: { d: [1, { y: 2, x: 1 }], c: null } })).toBe(stableJson({ a: { c: null, d: [1, { x: 1, y: 2 }] }, b: 1 }));
		expect(stableJson({ a: 1 })).not.toBe(stableJson({ a: 2 }));
	});
});

describe('one field list for parts lines (snapshots, the API, readers’ view)', () => {
	const stored = {
		id: 'l1',
		buildId: 'b1',
		position: 0,
		designators: 'CX1',
		quantity: 1,
		kind: 'capacitor',
		valueText: '100n',
		value: 1e-7,
		unit: 'F',
		tolerancePct: 10,
		ratingV: 275,
		ratingVAc: true,
		ratingW: null,
		package: 'box',
		notes: 'across the mains',
		designValueText: null,
		designValue: null,
		substitutionReason: null,
		deviationPct: null,
		mpn: 'X2-100N',
		supplier: 'Any shop',
		unitPrice: '0.3500',
		currency: 'EUR',
		perChannel: false,
		checks: [{ id: 'part.ac-rating' }]
	};

	it('keeps every stored field of a line, and gives it back whole', () => {
		const snap = snapshotPart(stored);
		// Everything but the row's place (build, position) is kept.
		const { buildId, position, ...rest } = stored;
		expect([buildId, position]).toEqual(['b1', 0]);
		expect(snap).toEqual(rest);
		expect(partLineOfSnapshot(snap)).toEqual(rest);
	});

	it('fills the fields an older snapshot predates with what they mean when absent', () => {
		const { ratingVAc, mpn, supplier, unitPrice, currency, perChannel, checks, ...old } = snapshotPart(stored);
		expect([ratingVAc, mpn, supplier, unitPrice, currency, perChannel, checks.length]).toEqual([true, 'X2-100N', 'Any shop', '0.3500', 'EUR', false, 1]);
		expect(partLineOfSnapshot(old)).toEqual({ ...old, ratingVAc: false, mpn: '', supplier: '', unitPrice: null, currency: null, perChannel: false, checks: [] });
	});
});
