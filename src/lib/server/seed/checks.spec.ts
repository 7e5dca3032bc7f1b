import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from './content';
import { checkBuild } from '$lib/specs';

// The invented demo scenario under the revision-2 checks: builds the scenario calls safe must raise nothing a
// reviewer would have to act on (notes only), and the build sent back for changes must show the findings.
const run = (key: string) => {
	const b = DEMO_BUILDS.find((x) => x.key === key)!;
	const r = checkBuild(
		b.specs,
		b.parts.map((p) => ({ designators: p.designators, kind: p.kind, value: null, ratingV: (p as { ratingV?: number }).ratingV ?? null }))
	);
	for (const o of r.blocks) if (!o.ok) throw o.error;
	return [...r.blocks.flatMap((o) => (o.ok ? o.checks : [])), ...r.cross].map((c) => `${c.id}:${c.level}`);
};

describe('demo builds under the revision-2 checks', () => {
	it('every block of every demo build passes its schema', () => {
		for (const b of DEMO_BUILDS) expect(() => run(b.key), b.key).not.toThrow();
	});
	it('safe-reviewed builds raise notes at most', () => {
		for (const b of DEMO_BUILDS.filter((x) => x.review === 'safe' || x.review === 'safe-changed'))
			expect(run(b.key).filter((c) => !c.endsWith(':note')), b.key).toEqual([]);
	});
	it('the chip amp says its worst case comes from its supply block', () => {
		expect(run('chipamp')).toContain('amp.rails-from-supply:note');
	});
	it('the class A build sent back for changes shows its claimed power beyond the bias limit', () => {
		expect(run('headphone')).toContain('amp.power-beyond-bias:caution');
	});
	it('the unearthed supply waiting for review shows the missing earth', () => {
		expect(run('supply')).toContain('supply.no-earth:danger');
	});
});
