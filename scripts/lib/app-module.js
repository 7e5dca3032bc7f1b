// Load one of the app's TypeScript server modules from a plain Node script (benchmarks, EXPLAIN):
// esbuild bundles it with the SvelteKit aliases the app uses ($lib, $env/dynamic/private → the
// process environment, $app/environment), packages stay external. Not for the running app.
import path from 'node:path';
import fs from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { build } from 'esbuild';

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

const aliases = {
	name: 'sveltekit-aliases',
	setup(b) {
		b.onResolve({ filter: /^\$env\/(dynamic|static)\/(private|public)$/ }, () => ({ path: 'env', namespace: 'sg-virtual' }));
		b.onResolve({ filter: /^\$app\/environment$/ }, () => ({ path: 'app-env', namespace: 'sg-virtual' }));
		b.onResolve({ filter: /^\$app\/server$/ }, () => ({ path: 'app-server', namespace: 'sg-virtual' }));
		b.onLoad({ filter: /^env$/, namespace: 'sg-virtual' }, () => ({ contents: 'export const env = process.env;', loader: 'js' }));
		b.onLoad({ filter: /^app-env$/, namespace: 'sg-virtual' }, () => ({
			contents: "export const building = false; export const dev = false; export const browser = false; export const version = 'script';",
			loader: 'js'
		}));
		b.onLoad({ filter: /^app-server$/, namespace: 'sg-virtual' }, () => ({
			contents: "export function getRequestEvent() { throw new Error('no request in a script'); }",
			loader: 'js'
		}));
		b.onResolve({ filter: /^\$lib(\/|$)/ }, async (args) => {
			const rel = args.path.replace(/^\$lib/, path.join(root, 'src', 'lib'));
			return b.resolve(rel.startsWith('/') ? rel : './' + rel, { resolveDir: root, kind: args.kind });
		});
	}
};

/** Import `src/...` (a path from the project root) as an ES module. */
export async function loadAppModule(rel) {
	const outDir = path.join(root, 'node_modules', '.cache', 'starground-scripts');
	fs.mkdirSync(outDir, { recursive: true });
	const outfile = path.join(outDir, `${rel.replace(/[^a-z0-9]+/gi, '_')}.mjs`);
	await build({
		entryPoints: [path.join(root, rel)],
		bundle: true,
		platform: 'node',
		format: 'esm',
		target: 'node20',
		outfile,
		packages: 'external',
		plugins: [aliases],
		logLevel: 'error'
	});
	return import(pathToFileURL(outfile).href + `?t=${Date.now()}`);
}
