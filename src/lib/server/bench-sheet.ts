/**
 * The bench sheet as a PDF (pdfkit), with a QR code back to the build's page (qrcode) and IBM Plex Sans embedded
 * (@ibm/plex-sans, SIL Open Font License 1.1: it has Ω, µ, ± and the minus sign the values use). Draws what
 * $lib/bench/sheet's benchSheet() returns: cautions first, checks before first power-up, the bring-up
 * expectations with empty boxes to write the measured value in, the parts grouped for kitting with a tick box
 * per line, then the spec values. A4, page numbers in the footer.
 */
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';
import type { Viewer } from './actor';
import { getBuildPage } from './builds/queries';
import { benchSheet, type BenchSheet } from '$lib/bench/sheet';

const fontDir = join(dirname(createRequire(import.meta.url).resolve('@ibm/plex-sans/package.json')), 'fonts', 'complete', 'woff');
const FONT = join(fontDir, 'IBMPlexSans-Regular.woff');
const FONT_BOLD = join(fontDir, 'IBMPlexSans-SemiBold.woff');

/** The sheet of the build at `slug` as `viewer` sees it (404 unless they may see it; readers get the published revision). */
export async function loadBenchSheet(slug: string, viewer: Viewer, origin: string): Promise<BenchSheet & { slug: string }> {
	const page = await getBuildPage(slug, viewer);
	const b = page.build;
	return {
		slug: b.slug,
		...benchSheet({
			title: b.title,
			slug: b.slug,
			url: `${origin}/builds/${b.slug}`,
			makerName: page.maker.name,
			revision: b.status === 'draft' ? 0 : b.revision,
			mainsPowered: b.mainsPowered,
			specBlocks: page.specBlocks,
			parts: page.parts
		})
	};
}

const A4 = { w: 595.28, h: 841.89 };
const M = 42;
const INK = '#1f2328';
const SOFT = '#5a606b';
const LINE = '#c9ccd1';
const DANGER = '#b3261e';

/** Render a bench sheet to PDF bytes. */
export async function renderBenchSheetPdf(sheet: BenchSheet): Promise<Buffer> {
	const qr = await QRCode.toBuffer(sheet.url, { type: 'png', errorCorrectionLevel: 'M', margin: 1, width: 240 });
	const doc = new PDFDocument({
		size: 'A4',
		margins: { top: M, bottom: M + 14, left: M, right: M },
		bufferPages: true,
		info: { Title: `Bench sheet: ${sheet.title}`, Author: 'Starground', Subject: sheet.url }
	});
	doc.registerFont('plex', FONT);
	doc.registerFont('plex-bold', FONT_BOLD);
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});

	const width = A4.w - 2 * M;
	const bottom = () => A4.h - M - 14;
	const ensure = (h: number) => {
		if (doc.y + h > bottom()) doc.addPage();
	};
	const heading = (text: string) => {
		ensure(40);
		doc.moveDown(0.6).font('plex-bold').fontSize(13).fillColor(INK).text(text, M, doc.y, { width });
		doc.moveTo(M, doc.y + 2).lineTo(M + width, doc.y + 2).lineWidth(0.6).strokeColor(LINE).stroke();
		doc.moveDown(0.4);
	};
	const tickBox = (x: number, y: number, s = 9) => doc.rect(x, y, s, s).lineWidth(0.8).strokeColor(INK).stroke();

	// Header: title, maker and revision, address; QR code to the right.
	const qrSize = 78;
	doc.image(qr, M + width - qrSize, M - 4, { width: qrSize, height: qrSize });
	doc.font('plex').fontSize(8).fillColor(SOFT).text('STARGROUND BENCH SHEET', M, M, { width: width - qrSize - 10 });
	doc.font('plex-bold').fontSize(19).fillColor(INK).text(sheet.title, { width: width - qrSize - 10 });
	doc.font('plex').fontSize(10).fillColor(SOFT).text(sheet.subtitle, { width: width - qrSize - 10 });
	doc.fillColor(SOFT).text(sheet.url, { width: width - qrSize - 10, link: sheet.url, underline: false });
	doc.y = Math.max(doc.y, M + qrSize + 4);

	// Cautions, in a box with its signal word.
	doc.moveDown(0.5);
	const boxTop = doc.y;
	doc.font('plex-bold').fontSize(10).fillColor(DANGER).text('CAUTION', M + 8, boxTop + 6, { width: width - 16 });
	doc.font('plex').fontSize(8.5).fillColor(INK);
	for (const c of sheet.cautions) doc.text(c, M + 8, doc.y + 2, { width: width - 16 });
	const boxBottom = doc.y + 6;
	doc.rect(M, boxTop, width, boxBottom - boxTop).lineWidth(1.2).strokeColor(DANGER).stroke();
	doc.y = boxBottom + 4;

	if (sheet.warnings.length) {
		heading('What the checks found');
		for (const w of sheet.warnings) {
			ensure(24);
			doc.font('plex-bold').fontSize(9).fillColor(w.level === 'danger' ? DANGER : INK).text(w.level === 'danger' ? 'DANGER  ' : 'CAUTION  ', M, doc.y, { continued: true });
			doc.font('plex').fillColor(INK).text(w.message, { width });
		}
	}

	heading('Before the first power-up');
	for (const t of sheet.before) {
		ensure(16);
		const y = doc.y + 1;
		tickBox(M, y);
		doc.font('plex').fontSize(9.5).fillColor(INK).text(t, M + 16, doc.y, { width: width - 16 });
		doc.moveDown(0.25);
	}

	heading('Bring-up: write in what you measure');
	const cols = { what: M, expect: M + 230, box: M + 370, unit: M + 470 };
	doc.font('plex-bold').fontSize(8).fillColor(SOFT);
	const hy = doc.y;
	doc.text('MEASURE', cols.what, hy).text('EXPECT', cols.expect, hy).text('MEASURED', cols.box, hy);
	doc.y = hy + 14;
	if (!sheet.boxes.length) doc.font('plex').fontSize(9).fillColor(SOFT).text('This build states no rails or channels: note your own figures here.', M, doc.y, { width });
	for (const b of sheet.boxes) {
		ensure(26);
		const y = doc.y;
		doc.font('plex').fontSize(9.5).fillColor(INK).text(b.what, cols.what, y + 5, { width: 222 });
		doc.text(b.expect, cols.expect, y + 5, { width: 135 });
		doc.rect(cols.box, y, 92, 20).lineWidth(0.8).strokeColor(INK).stroke();
		doc.fillColor(SOFT).text(b.unit, cols.unit, y + 5, { width: 40 });
		doc.y = y + 26;
	}

	heading('Parts, grouped for kitting');
	if (!sheet.kits.length) doc.font('plex').fontSize(9).fillColor(SOFT).text('No parts list.', M, doc.y);
	const pc = { box: M, qty: M + 14, des: M + 40, value: M + 150, rating: M + 250, pkg: M + 370 };
	for (const g of sheet.kits) {
		ensure(34);
		doc.font('plex-bold').fontSize(10).fillColor(INK).text(`${g.label} (${g.count})`, M, doc.y + 4, { width });
		doc.moveDown(0.15);
		for (const l of g.lines) {
			ensure(16);
			const y = doc.y;
			tickBox(pc.box, y + 1);
			doc.font('plex').fontSize(9).fillColor(INK);
			doc.text(`${l.quantity}×`, pc.qty, y, { width: 24 });
			doc.text(l.designators || '—', pc.des, y, { width: 104 });
			const h1 = doc.y;
			doc.font('plex-bold').text(l.value, pc.value, y, { width: 96 });
			const h2 = doc.y;
			doc.font('plex').fillColor(SOFT).text(l.rating || '', pc.rating, y, { width: 116 });
			const h3 = doc.y;
			doc.text([l.package, l.notes].filter(Boolean).join(' · '), pc.pkg, y, { width: M + width - pc.pkg });
			doc.y = Math.max(h1, h2, h3, doc.y) + 2;
		}
	}

	heading('Spec values');
	for (const s of sheet.specs) {
		ensure(30);
		doc.font('plex-bold').fontSize(10).fillColor(INK).text(s.heading, M, doc.y + 2, { width });
		for (const r of s.rows) {
			ensure(14);
			const y = doc.y;
			doc.font('plex').fontSize(8.5).fillColor(SOFT).text(r.label, M, y, { width: 300 });
			const h = doc.y;
			doc.fillColor(INK).text(r.value, M + 310, y, { width: width - 310 });
			doc.y = Math.max(h, doc.y);
		}
		doc.moveDown(0.4);
	}

	// Footer on every page.
	const range = doc.bufferedPageRange();
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		// Below the bottom margin: lift the margin while writing, else pdfkit starts a new page.
		const margin = doc.page.margins.bottom;
		doc.page.margins.bottom = 0;
		doc.font('plex').fontSize(7.5).fillColor(SOFT);
		doc.text(`${sheet.title} · page ${i + 1} of ${range.count}`, M, A4.h - M + 2, { width, align: 'center', lineBreak: false });
		doc.page.margins.bottom = margin;
	}
	doc.end();
	return done;
}
