// Local stand-in for a hosted mail service: an SMTP server (smtp-server) that keeps every
// message it receives in memory and as JSON files, with a small HTTP inbox for people and tests:
//   GET  /            — readable inbox in the browser
//   GET  /messages    — JSON list (newest first), optional ?to=address
//   DELETE /messages  — empty the inbox
//   POST /control/<name> — fault injection for tests (only when started with `controls: true`):
//                          smtp/stop, smtp/start, and whatever the caller registers (s3/stop, s3/start)
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';

const esc = (s) => String(s ?? '').replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** Start SMTP on 127.0.0.1:smtpPort and the inbox viewer on 127.0.0.1:httpPort. */
export async function startFakeSmtp({ smtpPort, httpPort, directory, controls = false }) {
	fs.mkdirSync(directory, { recursive: true });
	/** @type {any[]} */
	const messages = [];
	for (const f of fs.readdirSync(directory).filter((f) => f.endsWith('.json')).sort()) {
		try {
			messages.unshift(JSON.parse(fs.readFileSync(path.join(directory, f), 'utf8')));
		} catch {
			/* skip unreadable */
		}
	}
	let seq = messages.length;
	const makeSmtp = () => new SMTPServer({
		disabledCommands: ['STARTTLS', 'AUTH'],
		authOptional: true,
		disableReverseLookup: true,
		logger: false,
		// A stop for a fault test must not wait for the app's pooled connections to go idle.
		closeTimeout: 500,
		onData(stream, session, callback) {
			simpleParser(stream)
				.then((parsed) => {
					const msg = {
						id: `${Date.now()}-${++seq}`,
						receivedAt: new Date().toISOString(),
						from: parsed.from?.text ?? '',
						to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
						subject: parsed.subject ?? '',
						text: parsed.text ?? '',
						html: typeof parsed.html === 'string' ? parsed.html : '',
						headers: Object.fromEntries(
							[...parsed.headers].filter(([, v]) => typeof v === 'string').map(([k, v]) => [k, v])
						),
						// Every header as sent (lower-case name → value), also those mailparser turns into objects.
						rawHeaders: Object.fromEntries(
							(parsed.headerLines ?? []).map((h) => [h.key, h.line.slice(h.line.indexOf(':') + 1).replace(/\r?\n\s+/g, ' ').trim()])
						)
					};
					messages.unshift(msg);
					fs.writeFileSync(path.join(directory, `${msg.id}.json`), JSON.stringify(msg));
					callback();
				})
				.catch((err) => callback(err));
		}
	});
	let smtp = makeSmtp();
	let smtpUp = false;
	const listenSmtp = async () => {
		if (smtpUp) return;
		smtp = makeSmtp();
		await new Promise((resolve, reject) => {
			smtp.once('error', reject);
			smtp.listen(smtpPort, '127.0.0.1', resolve);
		});
		smtpUp = true;
	};
	const closeSmtp = async () => {
		if (!smtpUp) return;
		smtpUp = false;
		await new Promise((r) => smtp.close(r));
	};
	await listenSmtp();
	/** @type {Map<string, () => Promise<unknown>>} */
	const actions = new Map([
		['smtp/stop', closeSmtp],
		['smtp/start', listenSmtp]
	]);
	const web = http.createServer((req, res) => {
		const url = new URL(req.url ?? '/', 'http://x');
		if (controls && req.method === 'POST' && url.pathname.startsWith('/control/')) {
			const action = actions.get(url.pathname.slice('/control/'.length));
			if (!action) return void res.writeHead(404).end();
			action().then(
				() => res.writeHead(204).end(),
				(err) => res.writeHead(500, { 'content-type': 'text/plain' }).end(String(err?.message ?? err))
			);
			return;
		}
		if (url.pathname === '/messages' && req.method === 'DELETE') {
			messages.length = 0;
			for (const f of fs.readdirSync(directory)) fs.rmSync(path.join(directory, f), { force: true });
			res.writeHead(204).end();
			return;
		}
		if (url.pathname === '/messages') {
			const to = url.searchParams.get('to')?.toLowerCase();
			const list = to ? messages.filter((m) => m.to.includes(to)) : messages;
			res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(list));
			return;
		}
		if (url.pathname === '/') {
			const rows = messages
				.map(
					(m) =>
						`<article style="border-bottom:1px solid #ddd;padding:12px 0"><div><b>${esc(m.subject)}</b></div><div style="color:#666;font-size:13px">to ${esc(m.to.join(', '))} · ${esc(m.receivedAt)}</div><pre style="white-space:pre-wrap;font-size:13px">${esc(m.text)}</pre></article>`
				)
				.join('');
			res
				.writeHead(200, { 'content-type': 'text/html; charset=utf-8' })
				.end(`<!doctype html><meta charset=utf-8><title>Local inbox</title><body style="font-family:sans-serif;max-width:760px;margin:24px auto"><h1>Local inbox (development fake)</h1>${rows || '<p>No mail yet.</p>'}</body>`);
			return;
		}
		res.writeHead(404).end();
	});
	await new Promise((resolve, reject) => {
		web.once('error', reject);
		web.listen(httpPort, '127.0.0.1', resolve);
	});
	return {
		/** Register a fault-injection action under POST /control/<name> (tests). */
		control: (name, fn) => actions.set(name, fn),
		stop: async () => {
			await closeSmtp();
			web.closeAllConnections?.();
			await new Promise((r) => web.close(r));
		}
	};
}

if (import.meta.url === `file://${process.argv[1]}`) {
	const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
	const httpPort = Number(process.env.MAIL_VIEWER_PORT ?? 2580);
	await startFakeSmtp({ smtpPort, httpPort, directory: process.env.SMTP_FAKE_DIR ?? '.data/mail' });
	console.log(`fake SMTP on 127.0.0.1:${smtpPort}, inbox at http://127.0.0.1:${httpPort}/`);
}
