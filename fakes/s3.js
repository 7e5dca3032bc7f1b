// Local stand-in for hosted object storage: s3rver speaks the S3 HTTP API.
// The app talks to it through @aws-sdk/client-s3 exactly as to a hosted bucket.
import S3rver from 's3rver';
import fs from 'node:fs';

/** Start the fake S3 on 127.0.0.1:port, storing objects under directory, with `bucket` created. */
export async function startFakeS3({ port, directory, bucket }) {
	fs.mkdirSync(directory, { recursive: true });
	const make = () =>
		new S3rver({
			address: '127.0.0.1',
			port,
			silent: true,
			directory,
			configureBuckets: [{ name: bucket }]
		});
	let server = make();
	await server.run();
	let up = true;
	return {
		stop: async () => {
			if (!up) return;
			up = false;
			await server.close();
		},
		/** Start again after stop() (fault tests), with the same objects. */
		start: async () => {
			if (up) return;
			server = make();
			await server.run();
			up = true;
		}
	};
}

if (import.meta.url === `file://${process.argv[1]}`) {
	const port = Number(process.env.S3_FAKE_PORT ?? 4569);
	await startFakeS3({ port, directory: process.env.S3_FAKE_DIR ?? '.data/s3', bucket: process.env.S3_BUCKET ?? 'starground' });
	console.log(`fake S3 on http://127.0.0.1:${port}`);
}
