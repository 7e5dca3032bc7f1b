/** Checks on one parts-list line: substitutions that remove protection, ratings, tolerance, quantities. */
import { formatDeviation, formatPartValue, insideTolerance } from './values';
import type { NormalisedPartLine, PartCheck, PartContext } from './lines';

const CHARGE_NOTE =
	'Capacitors keep their charge and parts run above their rating can fail violently. This check certifies nothing; defer to local codes and licensed practice.';

/** Expand designators to a count: "R1, R2" → 2, "R1-R4" → 4, "C3–C5 C9" → 4. */
export function designatorCount(designators: string): number {
	let n = 0;
	for (const token of designators.split(/[\s,;]+/).filter(Boolean)) {
		const range = /^([A-Za-z]*)(\d+)\s*[-–]\s*([A-Za-z]*)(\d+)$/.exec(token);
		if (range && (range[3] === '' || range[3] === range[1]) && Number(range[4]) >= Number(range[2]))
			n += Number(range[4]) - Number(range[2]) + 1;
		else n += 1;
	}
	return n;
}

const FUSE_TEXT = /(fuse|^\s*[TF]?\s*\d+(?:\.\d+)?\s*m?A\s*[TF]?\s*$)/i;

/**
 * Checks on one normalised line:
 * - part.jumper-substitution (caution; danger where a fuse was): a 0 Ω link fitted where the design has a
 *   resistor or a fuse;
 * - part.rating-below-rail: the fitted voltage rating below the design's (caution), danger when the design
 *   part withstood the rail and the fitted one does not; for non-capacitors on a substitution line also
 *   caution when below the rail (capacitors get the cross check cross.cap-below-rail);
 * - part.outside-tolerance (note), part.no-reason (note), part.qty-mismatch (note).
 */
export function partChecks(
	line: Omit<NormalisedPartLine, 'checks'>,
	designRating: { volts: number | null; ac: boolean },
	ctx: PartContext = {}
): PartCheck[] {
	const designRatingV = designRating.volts;
	const checks: PartCheck[] = [];
	const who = line.designators || 'A line';
	const isSub = line.designValueText !== null && line.designValueText !== '';
	const railV = typeof ctx.railV === 'number' && Number.isFinite(ctx.railV) ? ctx.railV : null;

	if (isSub) {
		const fittedZero = (line.kind === 'jumper' || line.kind === 'resistor') && line.value === 0;
		const designWasResistor = typeof line.designValue === 'number' && line.designValue > 0;
		const designWasFuse = line.designValue === null && FUSE_TEXT.test(line.designValueText ?? '');
		if (fittedZero && (designWasResistor || designWasFuse || line.kind === 'jumper')) {
			const danger = designWasFuse;
			checks.push({
				id: 'part.jumper-substitution',
				level: danger ? 'danger' : 'caution',
				message: danger
					? `${who}: a wire link is fitted where the design has a fuse (${line.designValueText}); nothing then limits a fault current.`
					: `${who}: a jumper (0 Ω) is fitted where the design has ${designWasResistor ? formatPartValue(line.designValue, 'ohm') : `"${line.designValueText}"`}. A series resistor often limits current or keeps a stage stable (base/gate stopper, output isolation, Zobel); say why it is safe to leave out.`,
				values: { designators: line.designators, designValueOhm: line.designValue, fittedValueOhm: 0 },
				caution: 'Removing a protective part can let a fault burn or shock; this check certifies nothing. Defer to local codes and licensed practice.'
			});
		}
	}

	if (typeof line.ratingV === 'number' && line.ratingVAc) {
		// An AC rating (X/Y capacitors, "275 V AC") is not a DC rating: never compared with a DC rail or a DC design rating as if it were.
		const designAc = designRatingV !== null && designRating.ac;
		if (designAc && line.ratingV < designRatingV!)
			checks.push({
				id: 'part.rating-below-rail',
				level: 'caution',
				message: `${who}: fitted rated ${line.ratingV} V AC, lower than the design's ${designRatingV} V AC.`,
				values: { designators: line.designators, ratingVAc: line.ratingV, designRatingVAc: designRatingV },
				caution: CHARGE_NOTE
			});
		else if (railV !== null || (designRatingV !== null && !designAc))
			checks.push({
				id: 'part.ac-rating',
				level: 'note',
				message: `${who}: rated ${line.ratingV} V AC. An AC rating is not compared with ${
					designRatingV !== null && !designAc ? `the design's ${designRatingV} V DC rating` : `the ${Number(railV!.toPrecision(3))} V DC rail`
				} as if it were DC; X/Y capacitors belong across the mains. Where this part sees DC, check its DC rating in the datasheet.`,
				values: { designators: line.designators, ratingVAc: line.ratingV, railV }
			});
	} else if (typeof line.ratingV === 'number') {
		if (designRatingV !== null && designRating.ac) {
			checks.push({
				id: 'part.ac-rating',
				level: 'note',
				message: `${who}: fitted rated ${line.ratingV} V (DC) where the design gives ${designRatingV} V AC; the two are not compared as if they were the same kind of rating. Check the fitted part is rated for the mains it sits across.`,
				values: { designators: line.designators, ratingV: line.ratingV, designRatingVAc: designRatingV }
			});
		} else if (designRatingV !== null && line.ratingV < designRatingV) {
			const danger = railV !== null && line.ratingV < railV && railV <= designRatingV;
			checks.push({
				id: 'part.rating-below-rail',
				level: danger ? 'danger' : 'caution',
				message: danger
					? `${who}: fitted rated ${line.ratingV} V where the design has ${designRatingV} V, and the ${Number(railV!.toPrecision(3))} V rail is above the fitted rating: the design part withstood the rail, this one does not.`
					: `${who}: fitted rated ${line.ratingV} V, lower than the design's ${designRatingV} V. Check the voltage it sees in this circuit.`,
				values: { designators: line.designators, ratingV: line.ratingV, designRatingV, railV },
				caution: CHARGE_NOTE
			});
		} else if (isSub && railV !== null && line.ratingV < railV && line.kind !== 'capacitor') {
			checks.push({
				id: 'part.rating-below-rail',
				level: 'caution',
				message: `${who}: the substituted part is rated ${line.ratingV} V, below the ${Number(railV.toPrecision(3))} V rail. Fine only where it never sees the rail.`,
				values: { designators: line.designators, ratingV: line.ratingV, railV },
				caution: CHARGE_NOTE
			});
		}
	}

	if (isSub && line.deviationPct !== null && line.tolerancePct !== null && insideTolerance(line.deviationPct, line.tolerancePct) === false)
		checks.push({
			id: 'part.outside-tolerance',
			level: 'note',
			message: `${who}: the fitted value is ${formatDeviation(line.deviationPct)} off the design value, outside the part's ±${line.tolerancePct} % tolerance; say why the circuit does not mind.`,
			values: { designators: line.designators, deviationPct: line.deviationPct, tolerancePct: line.tolerancePct }
		});

	if (isSub && !line.substitutionReason)
		checks.push({
			id: 'part.no-reason',
			level: 'note',
			message: `${who}: a substitution without a reason; others repeating the build will want to know why.`,
			values: { designators: line.designators }
		});

	if (line.designators.trim() && line.quantity > 0) {
		const n = designatorCount(line.designators);
		if (n !== line.quantity)
			checks.push({
				id: 'part.qty-mismatch',
				level: 'note',
				message: `${who}: ${n} designator${n === 1 ? '' : 's'} but a quantity of ${line.quantity}.`,
				values: { designators: line.designators, designatorCount: n, quantity: line.quantity }
			});
	}
	return checks;
}

/**
 * The cautions of a list said once: each distinct caution text with the lines it concerns (designators, else the
 * kind), in list order. partsCautions([{ designators: 'C1', checks: [{ caution: 'X' }] }, { designators: 'C2', checks:
 * [{ caution: 'X' }] }]) → [{ text: 'X', lines: ['C1', 'C2'] }].
 */
export function partsCautions(lines: readonly { designators: string; kind: string; checks?: readonly { caution?: string }[] | null }[]): { text: string; lines: string[] }[] {
	const by = new Map<string, string[]>();
	for (const l of lines)
		for (const c of l.checks ?? []) {
			if (!c.caution) continue;
			const who = by.get(c.caution) ?? [];
			const name = l.designators || l.kind;
			if (!who.includes(name)) who.push(name);
			by.set(c.caution, who);
		}
	return [...by].map(([text, who]) => ({ text, lines: who }));
}
