/**
 * E-mail notifications (PRODUCT.md §4.5, §4.6): a review (sign-off or send-back) or a hazard tag lands on a
 * maker's build (code word for a hazard tag: `flag`), or
 * someone replies to a member's comment. Each kind can be turned off in /account or with the signed
 * one-click link in every message (/unsubscribe?token=…). Mail goes through the durable queue in
 * PostgreSQL (enqueueMail), so an SMTP outage delays it but loses none.
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

export const NOTIFY_KINDS = ['review', 'flag', 'reply'] as const;
export type NotifyKind = (typeof NOTIFY_KINDS)[number];

/** What each kind is, in words for the settings page and the unsubscribe page. */
export const NOTIFY_KIND_TEXT: Record<NotifyKind, string> = {
	review: 'a review lands on one of your builds',
	flag: 'a hazard tag on one of your builds (or one you hung) is tagged, cleared or gets a message',
	reply: 'someone replies to one of your comments'
};

const COLUMN = { review: 'notifyReview', flag: 'notifyFlag', reply: 'notifyReply' } as const satisfies Record<
	NotifyKind,
	keyof schema.User
>;

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

/**
 * A token that turns off one kind of mail for one member, without signing in. It names the member
 * and the kind and carries an HMAC-SHA256 over both, keyed with BETTER_AUTH_SECRET; it does not
 * expire (a link in an old mail still works) and grants nothing else.
 */
export function unsubscribeToken(userId: string, kind: NotifyKind): string {
	const payload = Buffer.from(`${userId}\n${kind}`, 'utf8').toString('base64url');
	return `${payload}.${sign(payload)}`;
}

/** The member and kind of a token, or null when it is malformed or its signature does not match. */
export function verifyUnsubscribeToken(token: string | null | undefined): { userId: string; kind: NotifyKind } | null {
	if (!token || token.length > 600) return null;
	const [payload, sig, ...rest] = token.split('.');
	if (!payload || !sig || rest.length) return null;
	const expected = Buffer.from(sign(payload));
	const given = Buffer.from(sig);
	if (expected.length !== given.length || !timingSafeEqual(expected, given)) return null;
	const [userId, kind] = Buffer.from(payload, 'base64url').toString('utf8').split('\n');
	if (!userId || !(NOTIFY_KINDS as readonly string[]).includes(kind)) return null;
	return { userId, kind: kind as NotifyKind };
}

/** The full unsubscribe link for a member and kind. */
export function unsubscribeUrl(userId: string, kind: NotifyKind): string {
	return `${origin()}/unsubscribe?token=${encodeURIComponent(unsubscribeToken(userId, kind))}`;
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

/**
 * Queue a notification. Never throws: the action that caused it has already been stored, and a
 * queue hiccup must not turn the member's successful action into an error. → the job id, or null
 * when nothing was queued (opted out, suspended, or the queue refused).
 */
async function send(userId: string, kind: NotifyKind, build: (to: { name: string; email: string }, unsub: string) => MailMessage) {
	try {
		const to = await recipient(userId, kind);
		if (!to) return null;
		return await enqueueMail(build(to, unsubscribeUrl(userId, kind)));
	} catch (err) {
		console.error(`[notify] could not queue a ${kind} notification`, err);
		return null;
	}
}

const buildUrl = (slug: string, hash = '') => `${origin()}/builds/${slug}${hash}`;

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

/** Tell a build's maker a reviewer signed off or sent back one revision of their build. */
export async function notifyReview(p: {
	ownerId: string;
	reviewerName: string;
	build: { slug: string; title: string };
	verdict: 'safe' | 'rework';
	revision: number;
	summaryMd: string;
}): Promise<string | null> {
	return send(p.ownerId, 'review', (to, unsub) =>
		composeMail({
			to: to.email,
			subject: `${verdictText(p.verdict, p.revision)}: “${p.build.title}”`,
			paragraphs: [
				`Hello ${to.name},`,
				p.verdict === 'safe'
					? `${p.reviewerName} reviewed ${revisionLabel(p.revision)} of your build “${p.build.title}” and signed it off as safe.`
					: `${p.reviewerName} reviewed ${revisionLabel(p.revision)} of your build “${p.build.title}” and sent it back for changes.`,
				`Summary: ${excerpt(p.summaryMd)}`,
				p.verdict === 'rework'
					? 'The hazard tags are listed at the top of the build page. Mark each one fixed when you have changed the build, then ask for review again.'
					: 'A sign-off as “safe” is a peer’s opinion of that revision, not a certification; keep deferring to local codes and licensed practice.'
			],
			action: { label: 'Open the build', url: buildUrl(p.build.slug, '#review-state') },
			unsubscribeUrl: unsub
		})
	);
}

/** Tell a build's maker a reviewer tagged a hazard on their build. */
export async function notifyFlag(p: {
	ownerId: string;
	reviewerName: string;
	build: { slug: string; title: string };
	flagId: string;
	category: string;
	severity: string;
	targetLabel: string;
	noteMd: string;
}): Promise<string | null> {
	const category = FLAG_CATEGORIES[p.category as FlagCategory] ?? p.category;
	const severity = FLAG_SEVERITIES[p.severity as FlagSeverity] ?? p.severity;
	return send(p.ownerId, 'flag', (to, unsub) =>
		composeMail({
			to: to.email,
			subject: `Hazard tagged on “${p.build.title}”: ${category}`,
			paragraphs: [
				`Hello ${to.name},`,
				`${p.reviewerName} tagged a hazard (${category}; ${severity.toLowerCase()}) on ${p.targetLabel} of your build “${p.build.title}”.`,
				`Note: ${excerpt(p.noteMd)}`,
				'When you have fixed it, mark the tag fixed with a note saying what you changed; a reviewer then clears it.'
			],
			action: { label: 'See the hazard tag', url: `${origin()}/builds/${p.build.slug}/hazards/${p.flagId}` },
			unsubscribeUrl: unsub
		})
	);
}

/**
 * Tell the other side of a hazard tag what happened to it (kind `flag`): a message in its thread, or a
 * reviewer clearing or re-tagging it (with their note).
 */
export async function notifyFlagUpdate(p: {
	toId: string;
	actorName: string;
	build: { slug: string; title: string };
	flagId: string;
	category: string;
	what: 'message' | 'cleared' | 'retagged';
	text: string;
}): Promise<string | null> {
	const category = FLAG_CATEGORIES[p.category as FlagCategory] ?? p.category;
	const said =
		p.what === 'message'
			? `${p.actorName} wrote on the hazard tag (${category}) on “${p.build.title}”:`
			: p.what === 'cleared'
				? `${p.actorName} cleared the hazard tag (${category}) on “${p.build.title}”.`
				: `${p.actorName} tagged the hazard (${category}) on “${p.build.title}” again.`;
	return send(p.toId, 'flag', (to, unsub) =>
		composeMail({
			to: to.email,
			subject:
				p.what === 'message'
					? `New message on a hazard tag on “${p.build.title}”`
					: p.what === 'cleared'
						? `Hazard tag cleared on “${p.build.title}”: ${category}`
						: `Hazard tagged again on “${p.build.title}”: ${category}`,
			paragraphs: [`Hello ${to.name},`, said, ...(p.text ? [excerpt(p.text)] : [])],
			action: { label: 'See the hazard tag', url: `${origin()}/builds/${p.build.slug}/hazards/${p.flagId}` },
			unsubscribeUrl: unsub
		})
	);
}

/** Tell a comment's author someone replied. */
export async function notifyReply(p: {
	parentAuthorId: string;
	replierName: string;
	build: { slug: string; title: string };
	commentId: string;
	bodyMd: string;
}): Promise<string | null> {
	return send(p.parentAuthorId, 'reply', (to, unsub) =>
		composeMail({
			to: to.email,
			subject: `${p.replierName} replied to your comment on “${p.build.title}”`,
			paragraphs: [`Hello ${to.name},`, `${p.replierName} replied to your comment on “${p.build.title}”:`, excerpt(p.bodyMd)],
			action: { label: 'Read the reply', url: buildUrl(p.build.slug, `#comment-${p.commentId}`) },
			unsubscribeUrl: unsub
		})
	);
}
