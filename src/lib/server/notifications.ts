/**
 * E-mail notifications (PRODUCT.md §4.5, §4.6): a review (sign-off or send-back) or a hazard tag lands on a
 * maker's build (code word for a hazard tag: `flag`), someone replies to a member's comment, comments on a
 * build they made or watch, or its maker publishes a new revision of a build they watch (server/watching).
 * Each kind can be turned off in /account or with the signed one-click link in every message
 * (/unsubscribe?token=…); the reviewers' desk digest (reviews/digest.ts) carries the same kind of link.
 * Mail goes through the durable queue in PostgreSQL (enqueueMail), so an SMTP outage delays it but loses none.
 */
import { createHmac, timingSafeEqual } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import { db } from './db';
import * as schema from './db/schema';
import { composeMail, enqueueMail, type MailMessage } from './mail';
import { FLAG_CATEGORIES, FLAG_SEVERITIES, verdictText, type FlagCategory, type FlagSeverity } from '$lib/reviews';
import { revisionLabel } from '$lib/revision-label';
import { watcherIds } from './watching';

export const NOTIFY_KINDS = ['review', 'flag', 'reply', 'comment', 'revision'] as const;
export type NotifyKind = (typeof NOTIFY_KINDS)[number];
/** What an unsubscribe link can turn off: a notification kind, or the reviewers' desk digest. */
export type MailKind = NotifyKind | 'digest';
const MAIL_KINDS: readonly string[] = [...NOTIFY_KINDS, 'digest'];

/** What each kind is, in words for the settings page and the unsubscribe page. */
export const NOTIFY_KIND_TEXT: Record<MailKind, string> = {
	review: 'a build of yours, or one you watch, is signed off or sent back',
	flag: 'a hazard tag on one of your builds (or one you hung, or a build you watch) is tagged, fixed, cleared or gets a message',
	reply: 'someone replies to one of your comments',
	comment: 'someone comments on one of your builds or a build you watch',
	revision: 'a build you watch gets a new revision',
	digest: 'makers ask for review in the categories you follow on the review desk (the review desk digest)'
};

const COLUMN = {
	review: 'notifyReview',
	flag: 'notifyFlag',
	reply: 'notifyReply',
	comment: 'notifyComment',
	revision: 'notifyRevision'
} as const satisfies Record<NotifyKind, keyof schema.User>;

function secret(): string {
	const s = env.BETTER_AUTH_SECRET;
	if (!s && !building) throw new Error('BETTER_AUTH_SECRET is not set');
	return s ?? 'build-time-placeholder';
}

function origin(): string {
	return (env.ORIGIN ?? env.BETTER_AUTH_URL ?? 'http://127.0.0.1:5173').replace(/\/$/, '');
}

function sign(payload: string): string {
	return createHmac('sha256', secret()).update(`unsubscribe:${payload}`).digest('base64url');
}

/** Days an unsubscribe link works (env UNSUBSCRIBE_LINK_DAYS, default 180). */
export function unsubscribeLinkDays(): number {
	const n = Number(env.UNSUBSCRIBE_LINK_DAYS ?? 180);
	return Number.isFinite(n) && n > 0 ? n : 180;
}

/**
 * A token that turns off one kind of mail for one member, without signing in. It names the member, the kind
 * and when it expires (UNSUBSCRIBE_LINK_DAYS after the mail was written) and carries an HMAC-SHA256 over all
 * three, keyed with BETTER_AUTH_SECRET (rotating the secret revokes every link); it grants nothing else.
 */
export function unsubscribeToken(userId: string, kind: MailKind, now = Date.now()): string {
	const expires = Math.floor(now / 1000) + Math.round(unsubscribeLinkDays() * 86_400);
	const payload = Buffer.from(`${userId}\n${kind}\n${expires}`, 'utf8').toString('base64url');
	return `${payload}.${sign(payload)}`;
}

export type UnsubscribeClaim = { ok: true; userId: string; kind: MailKind } | { ok: false; reason: 'invalid' | 'expired' };

/**
 * Read a token: its member and kind, or why it is refused — `invalid` when it is malformed or its signature
 * does not match (tampered, cut short), `expired` when it is past its date. Tokens from before links expired
 * (two fields, notification kinds only) are still honoured.
 */
export function readUnsubscribeToken(token: string | null | undefined, now = Date.now()): UnsubscribeClaim {
	const invalid = { ok: false, reason: 'invalid' } as const;
	if (!token || token.length > 600) return invalid;
	const [payload, sig, ...rest] = token.split('.');
	if (!payload || !sig || rest.length) return invalid;
	const expected = Buffer.from(sign(payload));
	const given = Buffer.from(sig);
	if (expected.length !== given.length || !timingSafeEqual(expected, given)) return invalid;
	const [userId, kind, expires, ...more] = Buffer.from(payload, 'base64url').toString('utf8').split('\n');
	if (!userId || !MAIL_KINDS.includes(kind) || more.length) return invalid;
	if (expires === undefined) {
		if (kind === 'digest') return invalid;
	} else {
		if (!/^\d{1,12}$/.test(expires)) return invalid;
		if (Number(expires) * 1000 < now) return { ok: false, reason: 'expired' };
	}
	return { ok: true, userId, kind: kind as MailKind };
}

/** The member and kind of a token, or null when it is malformed, tampered with or expired. */
export function verifyUnsubscribeToken(token: string | null | undefined): { userId: string; kind: MailKind } | null {
	const c = readUnsubscribeToken(token);
	return c.ok ? { userId: c.userId, kind: c.kind } : null;
}

/** The sentence a refused link gets (the page and the one-click POST alike). */
export function refusedLinkText(reason: 'invalid' | 'expired'): string {
	return reason === 'expired'
		? 'This unsubscribe link has expired. Open the link in a newer e-mail, or change your e-mail settings on your account page.'
		: 'This unsubscribe link is not valid. It may have been cut short or changed when copied; open it from the e-mail again, or change your e-mail settings on your account page.';
}

/** The full unsubscribe link for a member and kind. */
export function unsubscribeUrl(userId: string, kind: MailKind): string {
	return `${origin()}/unsubscribe?token=${encodeURIComponent(unsubscribeToken(userId, kind))}`;
}

/**
 * Turn one kind of mail on or off for a member. The desk digest is turned off by following no categories
 * (turning it on again is done by picking categories on the review desk). → false when the member does not exist.
 */
export async function setMailKind(userId: string, kind: MailKind, on: boolean): Promise<boolean> {
	if (kind === 'digest') {
		const [u] = await db.select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.id, userId));
		if (!u) return false;
		if (!on) await db.update(schema.reviewerSetting).set({ categories: [] }).where(eq(schema.reviewerSetting.userId, userId));
		return true;
	}
	return setNotification(userId, kind, on);
}

/** Turn one kind of notification on or off for a member. → false when the member does not exist. */
export async function setNotification(userId: string, kind: NotifyKind, on: boolean): Promise<boolean> {
	const rows = await db
		.update(schema.user)
		.set({ [COLUMN[kind]]: on })
		.where(eq(schema.user.id, userId))
		.returning({ id: schema.user.id });
	return rows.length > 0;
}

/** The recipient of a notification if they want this kind and can receive mail; null otherwise. */
async function recipient(userId: string, kind: NotifyKind) {
	const [u] = await db
		.select({
			id: schema.user.id,
			name: schema.user.name,
			email: schema.user.email,
			suspendedAt: schema.user.suspendedAt,
			on: schema.user[COLUMN[kind]]
		})
		.from(schema.user)
		.where(eq(schema.user.id, userId));
	if (!u || !u.on || u.suspendedAt) return null;
	return u;
}

type Compose = (to: { name: string; email: string }, unsub: string) => MailMessage;

/** One possible mail of an event: to whom, under which kind (their opt-out), and its text. */
export interface Candidate {
	userId: string;
	kind: NotifyKind;
	compose: Compose;
}

/**
 * Queue the mails of one event, at most ONE per member: `candidates` in order of preference (a member's first
 * candidate whose kind they have on is sent — "replied to your comment" before "new comment on a build you
 * watch"); the member who acted (`actorId`) gets none. Never throws: the action that caused it has already been
 * stored, and a queue hiccup must not turn the member's successful action into an error. → job ids queued.
 */
export async function notifyOnce(actorId: string | null, candidates: readonly Candidate[]): Promise<string[]> {
	const done = new Set<string>(actorId ? [actorId] : []);
	const ids: string[] = [];
	for (const c of candidates) {
		if (done.has(c.userId)) continue;
		try {
			const to = await recipient(c.userId, c.kind);
			if (!to) continue;
			done.add(c.userId);
			const id = await enqueueMail(c.compose(to, unsubscribeUrl(c.userId, c.kind)));
			if (id) ids.push(id);
		} catch (err) {
			done.add(c.userId);
			console.error(`[notify] could not queue a ${c.kind} notification`, err);
		}
	}
	return ids;
}

/**
 * The members watching a build who may still see it (server/watching), for an event's candidates. Never
 * throws (→ [] when the read fails: the owner's mail still goes).
 */
async function watchers(buildId: string | undefined): Promise<string[]> {
	if (!buildId) return [];
	try {
		return await watcherIds(buildId);
	} catch (err) {
		console.error('[notify] could not read the watchers', err);
		return [];
	}
}

const buildUrl = (slug: string, hash = '') => `${origin()}/builds/${slug}${hash}`;
const WATCH_NOTE = 'You get this because you watch this build; “Stop watching” is on its page.';

/** Plain-text excerpt of Markdown for a mail body (first ~400 characters, no markup). */
export function excerpt(md: string, max = 400): string {
	const flat = md
		.replace(/```[\s\S]*?```/g, ' ')
		.replace(/!\[[^\]]*\]\([^)]*\)/g, ' ')
		.replace(/\[([^\]]*)\]\([^)]*\)/g, '$1')
		.replace(/[#>*_`~|-]+/g, ' ')
		.replace(/\s+/g, ' ')
		.trim();
	return flat.length > max ? `${flat.slice(0, max - 1).trimEnd()}…` : flat;
}

type BuildRef = { id?: string; slug: string; title: string };

/**
 * A reviewer signed off or sent back one revision of a build: its maker (kind `review`) and its watchers (same
 * kind, their own wording) are told; the reviewer is not.
 */
export async function notifyReview(p: {
	ownerId: string;
	actorId?: string;
	reviewerName: string;
	build: BuildRef;
	verdict: 'safe' | 'rework';
	revision: number;
	summaryMd: string;
}): Promise<string | null> {
	const did = p.verdict === 'safe' ? 'signed it off as safe' : 'sent it back for changes';
	const caution =
		'A sign-off as “safe” is a peer’s opinion of that revision, not a certification; keep deferring to local codes and licensed practice.';
	const mail =
		(watching: boolean): Compose =>
		(to, unsub) =>
			composeMail({
				to: to.email,
				subject: `${verdictText(p.verdict, p.revision)}: “${p.build.title}”`,
				paragraphs: [
					`Hello ${to.name},`,
					watching
						? `${p.reviewerName} reviewed ${revisionLabel(p.revision)} of “${p.build.title}”, a build you watch, and ${did}.`
						: `${p.reviewerName} reviewed ${revisionLabel(p.revision)} of your build “${p.build.title}” and ${did}.`,
					`Summary: ${excerpt(p.summaryMd)}`,
					p.verdict === 'rework' && !watching
						? 'The hazard tags are listed at the top of the build page. Mark each one fixed when you have changed the build, then ask for review again.'
						: caution,
					...(watching ? [WATCH_NOTE] : [])
				],
				action: { label: 'Open the build', url: buildUrl(p.build.slug, '#review-state') },
				unsubscribeUrl: unsub
			});
	const ids = await notifyOnce(p.actorId ?? null, [
		{ userId: p.ownerId, kind: 'review', compose: mail(false) },
		...(await watchers(p.build.id)).map((userId) => ({ userId, kind: 'review' as const, compose: mail(true) }))
	]);
	return ids[0] ?? null;
}

/** A reviewer tagged a hazard on a build: its maker and its watchers are told (kind `flag`). */
export async function notifyFlag(p: {
	ownerId: string;
	actorId?: string;
	reviewerName: string;
	build: BuildRef;
	flagId: string;
	category: string;
	severity: string;
	targetLabel: string;
	noteMd: string;
}): Promise<string | null> {
	const category = FLAG_CATEGORIES[p.category as FlagCategory] ?? p.category;
	const severity = FLAG_SEVERITIES[p.severity as FlagSeverity] ?? p.severity;
	const mail =
		(watching: boolean): Compose =>
		(to, unsub) =>
			composeMail({
				to: to.email,
				subject: `Hazard tagged on “${p.build.title}”: ${category}`,
				paragraphs: [
					`Hello ${to.name},`,
					watching
						? `${p.reviewerName} tagged a hazard (${category}; ${severity.toLowerCase()}) on ${p.targetLabel} of “${p.build.title}”, a build you watch.`
						: `${p.reviewerName} tagged a hazard (${category}; ${severity.toLowerCase()}) on ${p.targetLabel} of your build “${p.build.title}”.`,
					`Note: ${excerpt(p.noteMd)}`,
					watching
						? WATCH_NOTE
						: 'When you have fixed it, mark the tag fixed with a note saying what you changed; a reviewer then clears it.'
				],
				action: { label: 'See the hazard tag', url: `${origin()}/builds/${p.build.slug}/hazards/${p.flagId}` },
				unsubscribeUrl: unsub
			});
	const ids = await notifyOnce(p.actorId ?? null, [
		{ userId: p.ownerId, kind: 'flag', compose: mail(false) },
		...(await watchers(p.build.id)).map((userId) => ({ userId, kind: 'flag' as const, compose: mail(true) }))
	]);
	return ids[0] ?? null;
}

/**
 * Tell the other side of a hazard tag what happened to it (kind `flag`): a message in its thread, the maker
 * marking it fixed, or a reviewer clearing or re-tagging it (with their note). A change of state (not a thread
 * message) goes to the build's watchers too.
 */
export async function notifyFlagUpdate(p: {
	toId: string;
	actorId?: string;
	actorName: string;
	build: BuildRef;
	flagId: string;
	category: string;
	what: 'message' | 'fixed' | 'cleared' | 'retagged';
	text: string;
}): Promise<string | null> {
	const category = FLAG_CATEGORIES[p.category as FlagCategory] ?? p.category;
	const said = {
		message: `${p.actorName} wrote on the hazard tag (${category}) on “${p.build.title}”:`,
		fixed: `${p.actorName} marked the hazard tag (${category}) on “${p.build.title}” fixed:`,
		cleared: `${p.actorName} cleared the hazard tag (${category}) on “${p.build.title}”.`,
		retagged: `${p.actorName} tagged the hazard (${category}) on “${p.build.title}” again.`
	}[p.what];
	const subject = {
		message: `New message on a hazard tag on “${p.build.title}”`,
		fixed: `Hazard tag marked fixed on “${p.build.title}”: ${category}`,
		cleared: `Hazard tag cleared on “${p.build.title}”: ${category}`,
		retagged: `Hazard tagged again on “${p.build.title}”: ${category}`
	}[p.what];
	const mail =
		(watching: boolean): Compose =>
		(to, unsub) =>
			composeMail({
				to: to.email,
				subject,
				paragraphs: [`Hello ${to.name},`, said, ...(p.text ? [excerpt(p.text)] : []), ...(watching ? [WATCH_NOTE] : [])],
				action: { label: 'See the hazard tag', url: `${origin()}/builds/${p.build.slug}/hazards/${p.flagId}` },
				unsubscribeUrl: unsub
			});
	const ids = await notifyOnce(p.actorId ?? null, [
		{ userId: p.toId, kind: 'flag', compose: mail(false) },
		...(p.what === 'message' ? [] : await watchers(p.build.id)).map((userId) => ({ userId, kind: 'flag' as const, compose: mail(true) }))
	]);
	return ids[0] ?? null;
}

/**
 * A new comment on a published build: the author of the comment it answers (kind `reply`), the build's maker
 * and its watchers (kind `comment`) are told, one mail each; the commenter is not.
 */
export async function notifyComment(p: {
	actorId: string;
	ownerId: string;
	parentAuthorId: string | null;
	commenterName: string;
	build: BuildRef;
	commentId: string;
	bodyMd: string;
}): Promise<string[]> {
	const mail =
		(whose: 'reply' | 'own' | 'watched'): Compose =>
		(to, unsub) =>
			composeMail({
				to: to.email,
				subject:
					whose === 'reply'
						? `${p.commenterName} replied to your comment on “${p.build.title}”`
						: `New comment on “${p.build.title}”`,
				paragraphs: [
					`Hello ${to.name},`,
					whose === 'reply'
						? `${p.commenterName} replied to your comment on “${p.build.title}”:`
						: whose === 'own'
							? `${p.commenterName} commented on your build “${p.build.title}”:`
							: `${p.commenterName} commented on “${p.build.title}”, a build you watch:`,
					excerpt(p.bodyMd),
					...(whose === 'watched' ? [WATCH_NOTE] : [])
				],
				action: { label: whose === 'reply' ? 'Read the reply' : 'Read the comment', url: buildUrl(p.build.slug, `#comment-${p.commentId}`) },
				unsubscribeUrl: unsub
			});
	const watching = await watchers(p.build.id);
	const candidates: Candidate[] = [];
	if (p.parentAuthorId) candidates.push({ userId: p.parentAuthorId, kind: 'reply', compose: mail('reply') });
	candidates.push({ userId: p.ownerId, kind: 'comment', compose: mail('own') });
	for (const userId of watching) candidates.push({ userId, kind: 'comment', compose: mail('watched') });
	return notifyOnce(p.actorId, candidates);
}

/** Its maker published a new revision of a build: its watchers are told (kind `revision`); the maker is not. */
export async function notifyRevision(p: {
	actorId: string;
	makerName: string;
	build: BuildRef & { id: string };
	revision: number;
	summary: string;
	note: string;
}): Promise<string[]> {
	const label = revisionLabel(p.revision);
	const compose: Compose = (to, unsub) =>
		composeMail({
			to: to.email,
			subject: `New revision of “${p.build.title}”: ${label}`,
			paragraphs: [
				`Hello ${to.name},`,
				`${p.makerName} published ${label} of “${p.build.title}”, a build you watch.`,
				`What changed: ${p.summary}.`,
				...(p.note ? [`The maker’s note: ${excerpt(p.note)}`] : []),
				'A sign-off given to an earlier revision does not cover the changes; the build page says when it was edited since sign-off.',
				WATCH_NOTE
			],
			action: { label: `See ${label}`, url: `${origin()}/builds/${p.build.slug}/revisions/${p.revision}` },
			unsubscribeUrl: unsub
		});
	return notifyOnce(
		p.actorId,
		(await watchers(p.build.id)).map((userId) => ({ userId, kind: 'revision' as const, compose }))
	);
}
