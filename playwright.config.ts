import { defineConfig } from '@playwright/test';

// The app, PostgreSQL and the fakes are started by scripts/test.js; this file only drives
// Debian's Chromium against them. No browser is ever downloaded.
export default defineConfig({
	testDir: 'tests',
	timeout: 60_000,
	expect: { timeout: 10_000 },
	fullyParallel: false,
	workers: Number(process.env.E2E_WORKERS ?? 2),
	retries: 0,
	reporter: [['list']],
	outputDir: '.data/test/playwright',
	use: {
		baseURL: process.env.ORIGIN ?? 'http://127.0.0.1:3100',
		trace: 'off',
		screenshot: 'only-on-failure',
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync',
				'--no-first-run',
				'--disable-quic'
			]
		}
	},
	projects: [
		{ name: 'chromium', testMatch: /.*\.e2e\.ts/, use: { browserName: 'chromium' } },
		// Stops PostgreSQL, SMTP and S3 under the running app: scripts/test.js runs it last, on its own.
		{ name: 'faults', testMatch: /.*\.fault\.ts/, use: { browserName: 'chromium' } }
	]
});
