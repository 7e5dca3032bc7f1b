// Unit tests of the revision compare page's differences (pure): expected results are worked out by hand
// from the two snapshots written out below.
import { describe, expect, it } from 'vitest';
import { diffRevisions, recordChanges, textRuns } from './revision-diff';
import type { BuildSnapshot, SnapshotPart } from './snapshot';

const part = (id: string, over: Partial<SnapshotPart>): SnapshotPart => ({
	id,
	designators: '',
	quantity: 1,
	kind: 'resistor',
	valueText: '',
	value: null,
	unit: null,
	tolerancePct: null,
	ratingV: null,
	ratingW: null,
	package: '',
	notes: '',
	designValueText: null,
	designValue: null,
	substitutionReason: null,
	deviationPct: null,
	...over
});

const A: BuildSnapshot = {
	version: 1,
	build: { title: 'Discrete amp', summary: '', category: 'power-amp', topology: 'class-ab-discrete', mainsPowered: true, licence: 'CC-BY-SA-4.0', coverPhotoId: null },
	steps: [
		{ id: 's1', title: 'Supply', bodyMd: 'Wind the toroid.\nFit a 2 A fuse.\nBond the earth.', bodyHtml: '', photoIds: ['p1'] },
		{ id: 's2', title: 'Output stage', bodyMd: 'Mount the devices.', bodyHtml: '', photoIds: [] }
	],
	specBlocks: [{ id: 'b1', kind: 'supply', title: 'Main', data: { secondaryVac: 22, fuse: { ratingA: 2, type: 'slow' } }, derived: {}, checks: [] }],
	parts: [part('l1', { designators: 'R1', valueText: '0R22', ratingW: 5 }), part('l2', { designators: 'C1', kind: 'capacitor', valueText: '10000u', ratingV: 35 })]
};

const B: BuildSnapshot = {
	...A,
	build: { ...A.build, title: 'Discrete amp, ±30 V' },
	steps: [
		{ id: 's1', title: 'Supply', bodyMd: 'Wind the toroid.\nFit a 1.6 A slow fuse.\nBond the earth.', bodyHtml: '', photoIds: ['p1', 'p2'] },
		{ id: 's2', title: 'Output stage', bodyMd: 'Mount the devices.', bodyHtml: '', photoIds: [] },
		{ id: 's3', title: 'Bring-up', bodyMd: 'Use a bulb tester.', bodyHtml: '', photoIds: [] }
	],
	specBlocks: [{ id: 'b1', kind: 'supply', title: 'Main', data: { secondaryVac: 22, fuse: { ratingA: 1.6, type: 'slow' } }, derived: {}, checks: [] }],
	// C1 saved again under a new id (delete-and-insert) with a higher rating; R1 unchanged; R2 new.
	parts: [part('l1', { designators: 'R1', valueText: '0R22', ratingW: 5 }), part('l9', { designators: 'C1', kind: 'capacitor', valueText: '10000u', ratingV: 50 }), part('l3', { designators: 'R2', valueText: '4k7' })]
};

describe('diffRevisions', () => {
	it('finds the changed title, the changed step line, the new step, the spec value and the parts changes', () => {
		const d = diffRevisions(A, B);
		expect(d.empty).toBe(false);
		expect(d.fields).toEqual([{ name: 'title', before: 'Discrete amp', after: 'Discrete amp, ±30 V' }]);

		expect(d.steps.map((s) => [s.title, s.status])).toEqual([
			['Supply', 'changed'],
			['Output stage', 'same'],
			['Bring-up', 'added']
		]);
		// Only the fuse line differs; the lines around it are kept.
		expect(d.steps[0].text).toEqual([
			{ kind: 'same', text: 'Wind the toroid.\n' },
			{ kind: 'removed', text: 'Fit a 2 A fuse.\n' },
			{ kind: 'added', text: 'Fit a 1.6 A slow fuse.\n' },
			{ kind: 'same', text: 'Bond the earth.\n' }
		]);
		expect(d.steps[0].photos).toEqual({ added: 1, removed: 0 });

		expect(d.specBlocks).toEqual([{ status: 'changed', label: 'supply: Main', fields: [{ name: 'fuse.ratingA', before: '2', after: '1.6' }] }]);

		expect(d.parts.map((p) => [p.label, p.status, p.fields])).toEqual([
			['R1 0R22', 'same', []],
			['C1 10000u', 'changed', [{ name: 'rating V', before: '35', after: '50' }]],
			['R2 4k7', 'added', expect.arrayContaining([{ name: 'value', before: '', after: '4k7' }])]
		]);
	});

	it('lists removed items after the kept ones, and says nothing differs between a snapshot and itself', () => {
		const d = diffRevisions(B, A);
		expect(d.steps.map((s) => s.status)).toEqual(['changed', 'same', 'removed']);
		expect(d.parts.at(-1)).toMatchObject({ label: 'R2 4k7', status: 'removed' });
		expect(diffRevisions(A, A).empty).toBe(true);
	});
});

describe('helpers', () => {
	it('textRuns is empty for equal texts and treats a missing last newline as none', () => {
		expect(textRuns('a\nb', 'a\nb')).toEqual([]);
		expect(textRuns('a', 'a\nb')).toEqual([
			{ kind: 'same', text: 'a\n' },
			{ kind: 'added', text: 'b\n' }
		]);
	});

	it('recordChanges flattens nested values and shows added and removed fields', () => {
		expect(recordChanges({ a: 1, n: { x: true } }, { a: 1, n: { x: false }, b: 'new' })).toEqual([
			{ name: 'n.x', before: 'true', after: 'false' },
			{ name: 'b', before: '', after: 'new' }
		]);
	});
});
