/**
 * Files attached to a build — what they can be and how they are described. Pure; shared by the server
 * ($lib/server/attachments) and the pages.
 */

/** What a maker attaches: the schematic, PCB and fabrication files, the enclosure drawing, anything else. */
export const ATTACHMENT_KINDS = ['schematic', 'pcb', 'enclosure', 'other'] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];

export const ATTACHMENT_KIND_LABELS: Record<AttachmentKind, string> = {
	schematic: 'Schematic',
	pcb: 'PCB and fabrication files',
	enclosure: 'Enclosure drawing',
	other: 'Other'
};

/** Types accepted, found from the file's content (never its name): extension → MIME type and words. */
export const ATTACHMENT_TYPES = {
	pdf: { mime: 'application/pdf', label: 'PDF' },
	png: { mime: 'image/png', label: 'PNG image' },
	jpg: { mime: 'image/jpeg', label: 'JPEG image' },
	zip: { mime: 'application/zip', label: 'ZIP archive' }
} as const;
export type AttachmentExt = keyof typeof ATTACHMENT_TYPES;

/** For the file picker's `accept` (a hint only: the server checks the content). */
export const ATTACHMENT_ACCEPT = '.pdf,.png,.jpg,.jpeg,.zip,application/pdf,image/png,image/jpeg,application/zip';

/** Longest file name kept, in characters (the extension included). */
export const ATTACHMENT_NAME_MAX = 120;
/** At most this many files per build. */
export const ATTACHMENTS_PER_BUILD = 20;

/** A size in bytes as people read it: 812 bytes, 14.2 KB, 3.4 MB (1 KB = 1024 bytes, 3 significant figures). */
export function formatBytes(n: number): string {
	if (!Number.isFinite(n) || n < 0) throw new RangeError('size must be a non-negative number of bytes');
	if (n < 1024) return `${n} byte${n === 1 ? '' : 's'}`;
	const units = ['KB', 'MB', 'GB'];
	let v = n / 1024;
	let u = 0;
	while (v >= 1024 && u < units.length - 1) {
		v /= 1024;
		u++;
	}
	return `${Number(v.toPrecision(3))} ${units[u]}`;
}

/** What the build page shows for one attachment. */
export interface AttachmentView {
	id: string;
	kind: AttachmentKind;
	name: string;
	ext: AttachmentExt;
	sizeBytes: number;
	/** The download URL (served with Content-Disposition: attachment). */
	url: string;
}
