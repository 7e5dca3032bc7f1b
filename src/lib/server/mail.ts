import nodemailer, { type Transporter } from 'nodemailer';
import PgBoss from 'pg-boss';
import { env } from '$env/dynamic/private';
import { escapeUTF8 as escapeHtml } from 'entities';

/** One outgoing message; every message has a plain-text and an HTML part. */
export interface MailMessage {
	to: string;
	subject: string;
	text: string;
	html: string;
	/** Unsubscribe link for notifications (List-Unsubscribe header and footer). */
	unsubscribeUrl?: string;
}

const QUEUE = 'mail';

let transport: Transporter | null = null;
function getTransport() {
	transport ??= nodemailer.createTransport({
		host: env.SMTP_HOST ?? '127.0.0.1',
		port: Number(env.SMTP_PORT ?? 2525),
		secure: env.SMTP_SECURE === 'true',
		auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' } : undefined,
		ignoreTLS: env.SMTP_SECURE !== 'true' && env.SMTP_REQUIRE_TLS !== 'true',
		requireTLS: env.SMTP_REQUIRE_TLS === 'true',
		pool: true,
		connectionTimeout: 5_000
	});
	return transport;
}

/** Send now, through SMTP. Throws when the server cannot be reached (the queue retries). */
export async function deliver(msg: MailMessage): Promise<void> {
	await getTransport().sendMail({
		from: env.MAIL_FROM ?? 'Starground <no-reply@starground.test>',
		to: msg.to,
		subject: msg.subject,
		text: msg.text,
		html: msg.html,
		headers: msg.unsubscribeUrl ? listUnsubscribeHeaders(msg.unsubscribeUrl) : undefined
	});
}

/**
 * RFC 2369 List-Unsubscribe with the RFC 8058 one-click POST: the mail client posts
 * `List-Unsubscribe=One-Click` to /unsubscribe/one-click with the same signed token.
 */
export function listUnsubscribeHeaders(unsubscribeUrl: string): Record<string, string> {
	const oneClick = new URL(unsubscribeUrl);
	oneClick.pathname = '/unsubscribe/one-click';
	return { 'List-Unsubscribe': `<${oneClick.toString()}>`, 'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click' };
}

let bossPromise: Promise<PgBoss> | null = null;

/** The durable job queue in PostgreSQL (pg-boss), started once per process. */
export function getBoss(): Promise<PgBoss> {
	bossPromise ??= (async () => {
		if (!env.DATABASE_URL) throw new Error('DATABASE_URL is not set');
		const boss = new PgBoss({ connectionString: env.DATABASE_URL, schema: 'pgboss', max: 3 });
		boss.on('error', (err) => console.error('[queue]', err.message));
		await boss.start();
		await boss.createQueue(QUEUE).catch(() => {});
		return boss;
	})();
	return bossPromise;
}

/**
 * Queue a message. It is stored in PostgreSQL first and sent by the worker with retries and
 * exponential backoff, so an SMTP outage delays mail but loses none.
 */
export async function enqueueMail(msg: MailMessage): Promise<string | null> {
	const boss = await getBoss();
	// The job is stored as JSON in PostgreSQL, which refuses \u0000 and lone surrogates: member-written text
	// (names, titles, comment excerpts) may hold either, so every string goes in well-formed and without NUL.
	return boss.send(QUEUE, jsonSafe(msg), {
		retryLimit: Number(env.MAIL_RETRY_LIMIT ?? 25),
		retryDelay: Number(env.MAIL_RETRY_DELAY_S ?? 5),
		retryBackoff: true
	});
}

/** A copy of `value` whose strings PostgreSQL's JSON types accept: lone surrogates → U+FFFD, NUL removed. */
export function jsonSafe<T>(value: T): T {
	return JSON.parse(JSON.stringify(value, (_k, v) => (typeof v === 'string' ? v.toWellFormed().replaceAll('\u0000', '') : v)));
}

let workerStarted = false;

/** Start sending queued mail from this process. */
export async function startMailWorker(): Promise<void> {
	if (workerStarted) return;
	workerStarted = true;
	const boss = await getBoss();
	await boss.work<MailMessage>(
		QUEUE,
		{ pollingIntervalSeconds: Number(env.MAIL_POLL_S ?? 1), batchSize: 5 },
		async (jobs) => {
			for (const job of jobs) await deliver(job.data);
		}
	);
}

/** Stop the queue (tests, shutdown). */
export async function stopMail(): Promise<void> {
	if (bossPromise) {
		const boss = await bossPromise;
		bossPromise = null;
		workerStarted = false;
		await boss.stop({ graceful: true, timeout: 5000 });
	}
	transport?.close();
	transport = null;
}


/**
 * Lay out a message in Starground's plain style: a greeting, paragraphs, one action link,
 * and an unsubscribe footer for notifications.
 */
export function composeMail(opts: {
	to: string;
	subject: string;
	paragraphs: string[];
	action?: { label: string; url: string };
	unsubscribeUrl?: string;
}): MailMessage {
	const { to, subject, paragraphs, action, unsubscribeUrl } = opts;
	const textParts = [...paragraphs];
	if (action) textParts.push(`${action.label}: ${action.url}`);
	if (unsubscribeUrl) textParts.push(`You get this because of your notification settings. Turn it off: ${unsubscribeUrl}`);
	textParts.push('— Starground');
	const htmlParas = paragraphs.map((p) => `<p style="margin:0 0 12px">${escapeHtml(p)}</p>`).join('');
	const htmlAction = action
		? `<p style="margin:16px 0"><a href="${escapeHtml(action.url)}" style="background:#b0592b;color:#fff;padding:8px 14px;border-radius:4px;text-decoration:none">${escapeHtml(action.label)}</a></p><p style="font-size:12px;color:#7a7264">Or open: ${escapeHtml(action.url)}</p>`
		: '';
	const htmlFooter = unsubscribeUrl
		? `<p style="font-size:12px;color:#7a7264;margin-top:24px">You get this because of your notification settings. <a href="${escapeHtml(unsubscribeUrl)}">Turn it off</a>.</p>`
		: '';
	const html = `<!doctype html><html><body style="font-family:sans-serif;background:#f7f2e8;color:#1f1d1a;padding:24px"><div style="max-width:560px;margin:auto;background:#fff;border:1px solid #ddd2bd;padding:24px;border-radius:6px"><p style="font-weight:600;color:#8a4220;margin:0 0 16px">Starground</p>${htmlParas}${htmlAction}${htmlFooter}</div></body></html>`;
	return { to, subject, text: textParts.join('\n\n'), html, unsubscribeUrl };
}
