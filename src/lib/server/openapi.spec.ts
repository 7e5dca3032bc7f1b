import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { GET } from '../../routes/api/v1/openapi.json/+server';

const API_ROOT = path.resolve(__dirname, '../../routes/api/v1');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** Every +server.ts under src/routes/api/v1 → its OpenAPI path and the HTTP methods it exports. */
function routesOnDisk(): { path: string; methods: string[] }[] {
	const out: { path: string; methods: string[] }[] = [];
	const walk = (dir: string) => {
		for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
			const full = path.join(dir, entry.name);
			if (entry.isDirectory()) walk(full);
			else if (entry.name === '+server.ts' || entry.name === '+server.js') {
				const rel = path.relative(API_ROOT, dir).split(path.sep).filter(Boolean);
				const segments = rel.filter((s) => !/^\(.*\)$/.test(s)).map((s) => s.replace(/^\[(?:\.\.\.)?(\w+)\]$/, '{$1}'));
				const text = fs.readFileSync(full, 'utf8');
				const methods = METHODS.filter((m) => new RegExp(`export\\s+(const|(async\\s+)?function)\\s+${m}\\b`).test(text));
				out.push({ path: ['/api/v1', ...segments].join('/'), methods });
			}
		}
	};
	walk(API_ROOT);
	return out;
}

describe('GET /api/v1/openapi.json', () => {
	it('is an OpenAPI 3.1 document that parses and lists every /api/v1 route and method on disk', async () => {
		const url = new URL('http://127.0.0.1:5216/api/v1/openapi.json');
		const res = await GET({ url, request: new Request(url) } as never);
		expect(res.status).toBe(200);
		const doc = JSON.parse(await res.text());
		expect(doc.openapi).toBe('3.1.0');
		expect(doc.info.title).toBeTruthy();
		const disk = routesOnDisk();
		expect(disk.length).toBeGreaterThan(15);
		const missing: string[] = [];
		for (const r of disk) {
			expect(r.methods.length, `${r.path} exports a method`).toBeGreaterThan(0);
			for (const m of r.methods) if (!doc.paths[r.path]?.[m.toLowerCase()]) missing.push(`${m} ${r.path}`);
		}
		expect(missing).toEqual([]);
		// And nothing documented that does not exist.
		const onDisk = new Set(disk.flatMap((r) => r.methods.map((m) => `${m.toLowerCase()} ${r.path}`)));
		const documented = Object.entries(doc.paths).flatMap(([p, item]) => Object.keys(item as object).map((m) => `${m} ${p}`));
		expect(documented.filter((d) => !onDisk.has(d))).toEqual([]);
	});

	it('publishes the zod ranges and enums, the error envelope and references that resolve', async () => {
		const url = new URL('http://127.0.0.1:5216/api/v1/openapi.json');
		const doc = JSON.parse(await (await GET({ url, request: new Request(url) } as never)).text());
		const amp = doc.paths['/api/v1/tools/amplifier'].post.requestBody.content['application/json'].schema;
		expect(amp.properties.loadOhm).toMatchObject({ type: 'number', minimum: 0.5 });
		expect(amp.properties.supply.enum).toEqual(['split', 'single']);
		expect(amp.required).toEqual(expect.arrayContaining(['supply', 'railV', 'loadOhm']));
		expect(amp.required).not.toContain('dropoutV'); // has a default
		const list = doc.paths['/api/v1/builds'].get.parameters;
		expect(list.find((p: { name: string }) => p.name === 'limit').schema).toMatchObject({ type: 'integer', minimum: 1, maximum: 100 });
		expect(list.find((p: { name: string }) => p.name === 'review').schema.enum).toEqual(['unreviewed', 'waiting', 'safe', 'rework', 'changed']);
		// Every $ref points at something in the document.
		const refs = [...JSON.stringify(doc).matchAll(/"\$ref":"#\/([^"]+)"/g)].map((m) => m[1]);
		expect(refs.length).toBeGreaterThan(0);
		for (const ref of refs) {
			const target = ref.split('/').reduce((o: any, k) => o?.[k], doc);
			expect(target, ref).toBeTruthy();
		}
		expect(doc.components.schemas.Error.properties.error.required).toEqual(['code', 'message', 'issues']);
		expect(doc.paths['/api/v1/builds/{slug}/comments'].post.responses['429']).toBeTruthy();
	});
});
