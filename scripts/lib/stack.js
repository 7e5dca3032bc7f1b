// Start what the app needs on loopback — PostgreSQL, the fake S3 and the fake SMTP inbox —
// and give back the environment that points the app at them. Used by `npm start` and `npm test`.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { startPostgres, portInUse } from './postgres.js';
import { runMigrations } from '../migrate.js';
import { startFakeS3 } from '../../fakes/s3.js';
import { startFakeSmtp } from '../../fakes/smtp.js';

async function requireFree(port, what) {
	if (await portInUse(port)) throw new Error(`Port ${port} (${what}) on 127.0.0.1 is already taken. Choose another (see README).`);
}

/**
 * @param {{ root: string, pgPort: number, s3Port: number, smtpPort: number, mailViewerPort: number,
 *           appPort: number, database: string, fast?: boolean, controls?: boolean,
 *           stops?: Array<() => unknown>, onStarted?: (what: string, pid: number | undefined) => void }} o
 */
export async function startStack(o) {
	// The caller may pass its own array, so a signal that arrives while we are still starting can stop
	// what has been started so far.
	const stops = o.stops ?? [];
	const stop = async () => {
		for (const s of stops.reverse()) {
			try {
				await s();
			} catch (err) {
				console.error('stop failed:', err.message);
			}
		}
		stops.length = 0;
	};
	try {
		// Its stop is registered the moment pg_ctl has started it (not when this returns), with its process id.
		const pg = await startPostgres({
			root: path.join(o.root, 'postgres'),
			port: o.pgPort,
			database: o.database,
			fast: o.fast,
			onStarted: (stopPg, pid) => {
				stops.push(stopPg);
				o.onStarted?.('postgres', pid);
			}
		});
		await runMigrations(pg.url);
		await requireFree(o.s3Port, 'fake S3');
		const s3 = await startFakeS3({ port: o.s3Port, directory: path.join(o.root, 's3'), bucket: 'starground' });
		stops.push(() => s3.stop());
		await requireFree(o.smtpPort, 'fake SMTP');
		await requireFree(o.mailViewerPort, 'inbox viewer');
		const smtp = await startFakeSmtp({ smtpPort: o.smtpPort, httpPort: o.mailViewerPort, directory: path.join(o.root, 'mail'), controls: !!o.controls });
		stops.push(() => smtp.stop());
		if (o.controls) {
			// Fault tests stop and start the fakes through the inbox viewer (POST /control/s3/stop …).
			smtp.control('s3/stop', () => s3.stop());
			smtp.control('s3/start', () => s3.start());
		}

		const secretFile = path.join(o.root, 'auth-secret');
		if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, crypto.randomBytes(32).toString('hex'), { mode: 0o600 });
		const origin = `http://127.0.0.1:${o.appPort}`;
		const env = {
			DATABASE_URL: pg.url,
			ORIGIN: origin,
			BETTER_AUTH_URL: origin,
			BETTER_AUTH_SECRET: fs.readFileSync(secretFile, 'utf8').trim(),
			HOST: '127.0.0.1',
			PORT: String(o.appPort),
			S3_ENDPOINT: `http://127.0.0.1:${o.s3Port}`,
			S3_REGION: 'us-east-1',
			S3_BUCKET: 'starground',
			S3_ACCESS_KEY_ID: 'S3RVER',
			S3_SECRET_ACCESS_KEY: 'S3RVER',
			S3_FORCE_PATH_STYLE: 'true',
			// adapter-node refuses request bodies over 512 KB by default; photos may be up to PHOTO_MAX_BYTES (15 MB).
			BODY_SIZE_LIMIT: '16M',
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: String(o.smtpPort),
			MAIL_FROM: 'Starground <no-reply@starground.test>',
			MAIL_VIEWER_URL: `http://127.0.0.1:${o.mailViewerPort}`
		};
		return { env, stop, stops };
	} catch (err) {
		await stop();
		throw err;
	}
}
