import { describe, it, expect, vi, afterAll } from 'vitest';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { createScratchDatabase } from './testing/db';

// A port nobody listens on yet: the SMTP server is "down" until the test starts it there.
const port = await new Promise<number>((resolve) => {
	const s = net.createServer().listen(0, '127.0.0.1', () => {
		const p = (s.address() as net.AddressInfo).port;
		s.close(() => resolve(p));
	});
});
// Its own database, so no other worker on the shared server takes the job.
const scratch = await createScratchDatabase('mail');
vi.mock('$env/dynamic/private', () => ({
	env: { ...process.env, DATABASE_URL: scratch.url, SMTP_HOST: '127.0.0.1', SMTP_PORT: String(port), MAIL_RETRY_DELAY_S: '1', MAIL_POLL_S: '0.5' }
}));

const { enqueueMail, startMailWorker, stopMail, composeMail } = await import('./mail');
const { startFakeSmtp } = await import('../../../fakes/smtp.js');

describe('mail queue', () => {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sg-mail-'));
	let smtp: { stop: () => Promise<void> } | null = null;
	afterAll(async () => {
		await stopMail();
		await smtp?.stop();
		await scratch.drop();
		fs.rmSync(dir, { recursive: true, force: true });
	});

	it('composes a plain-text and an HTML part with an unsubscribe link', () => {
		const m = composeMail({
			to: 'a@example.test',
			subject: 'S',
			paragraphs: ['Hello <b>you</b>'],
			action: { label: 'Open', url: 'http://x/b' },
			unsubscribeUrl: 'http://x/u'
		});
		expect(m.text).toContain('Open: http://x/b');
		expect(m.text).toContain('http://x/u');
		expect(m.html).toContain('Hello &lt;b&gt;you&lt;/b&gt;');
		expect(m.html).toContain('href="http://x/u"');
	});

	it('queues member text that PostgreSQL JSON refuses as written: a lone surrogate and NUL (22P02 without jsonSafe)', async () => {
		const id = await enqueueMail(composeMail({ to: 'odd@example.test', subject: 'Lone \udc00 low and \u0000 NUL', paragraphs: ['a \ud800 high'] }));
		expect(id).toBeTruthy();
	});

	it('loses nothing while the SMTP server is down and delivers once it is back', async () => {
		const to = `queued-${Date.now()}@example.test`;
		await enqueueMail(composeMail({ to, subject: 'Queued while down', paragraphs: ['kept in PostgreSQL'] }));
		await startMailWorker();
		// Let the worker try (and fail) a few times against the closed port.
		await new Promise((r) => setTimeout(r, 2500));
		const port2 = port + 1 === 65536 ? port - 1 : port + 1;
		smtp = await startFakeSmtp({ smtpPort: port, httpPort: port2, directory: dir });
		const until = Date.now() + 40_000;
		let got: { subject: string; to: string[] }[] = [];
		while (Date.now() < until) {
			got = await (await fetch(`http://127.0.0.1:${port2}/messages?to=${encodeURIComponent(to)}`)).json();
			if (got.length) break;
			await new Promise((r) => setTimeout(r, 500));
		}
		expect(got.map((m) => m.subject)).toEqual(['Queued while down']);
	}, 60_000);
});
