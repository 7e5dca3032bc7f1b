import { test, expect, type Page, type Locator } from '@playwright/test';

// Every expected number below is worked out here from the formulas in REFERENCE.md with the inputs the
// test types — never read back from the page. Displays have 3 (or 4) significant figures, so a number
// is compared within half a unit of its last shown digit.

/** The leading number of a result's text ("78.1 W" → 78.1, "−6 %" → −6). */
function leadingNumber(text: string): number {
	const m = /[-\u2212]?\d[\d\s\u202f,]*(?:\.\d+)?/.exec(text);
	if (!m) throw new Error(`no number in "${text}"`);
	return Number(m[0].replace(/\u2212/, '-').replace(/[\s\u202f,]/g, ''));
}

/** Expects the result to show `expected` to the precision displayed (3 significant figures unless told). */
async function expectShown(result: Locator, expected: number, digits = 3) {
	await expect
		.poll(async () => {
			const text = (await result.textContent()) ?? '';
			if (!/\d/.test(text)) return false; // "—" while a field is empty or the result is on its way
			const shown = leadingNumber(text);
			return Math.abs(shown - expected) <= Math.abs(expected) * 0.5 * 10 ** (1 - digits);
		}, { message: `expected about ${expected}` })
		.toBe(true);
}

/** Marks the page so a reload would be noticed (a reload drops the mark). */
async function markPage(page: Page) {
	await page.evaluate(() => ((window as unknown as { __toolMark: number }).__toolMark = 42));
}
async function expectSamePage(page: Page) {
	expect(await page.evaluate(() => (window as unknown as { __toolMark?: number }).__toolMark)).toBe(42);
}

/** Types into a field once the page has hydrated (retries until the typed value takes effect). */
async function typeLive(page: Page, label: string | RegExp, text: string, check: () => Promise<void>) {
	await expect(async () => {
		await page.getByLabel(label, { exact: true }).fill(text);
		await check();
	}).toPass({ timeout: 15_000 });
}

test('amplifier tool: first paint has the plot, results follow the inputs without a reload', async ({ page }) => {
	await page.goto('/tools/amplifier');
	// Server-rendered plot with both loads, before anything is typed.
	const plot = page.getByRole('img', { name: /Maximum sine power against rail voltage/ });
	await expect(plot).toBeVisible();
	await expect(plot.locator('path[data-series="8 Ω"]')).toHaveCount(1);
	await expect(plot.locator('path[data-series="4 Ω"]')).toHaveCount(1);
	const before4 = await plot.locator('path[data-series="4 Ω"]').getAttribute('d');

	// Defaults ±35 V, 8 Ω, 3 V dropout → (35 − 3)² / (2 · 8) = 64 W.
	await expectShown(page.getByTestId('maxPowerW'), (35 - 3) ** 2 / (2 * 8));
	await markPage(page);

	const rail = 28;
	const dropout = 3;
	await typeLive(page, 'Rail voltage (each side, ±)', String(rail), async () => {
		await expectShown(page.getByTestId('maxPowerW'), (rail - dropout) ** 2 / (2 * 8));
	});
	const load = 4;
	await page.getByLabel('Load', { exact: true }).fill(String(load));
	const vpk = rail - dropout;
	await expectShown(page.getByTestId('maxPowerW'), vpk ** 2 / (2 * load));
	await expectShown(page.getByTestId('peakCurrentA'), vpk / load);
	await expectShown(page.getByTestId('worstDissipationW'), (2 * rail ** 2) / (Math.PI ** 2 * load));

	// An output power to evaluate: supply power 2·Vrail·Vpk/(π·RL) with Vpk = √(2·P·RL).
	const outputW = 20;
	await page.getByLabel('Output power to evaluate (optional)', { exact: true }).fill(String(outputW));
	const vpkAt = Math.sqrt(2 * outputW * load);
	const pin = (2 * rail * vpkAt) / (Math.PI * load);
	await expectShown(page.getByTestId('supplyPowerW'), pin);
	await expectShown(page.getByTestId('dissipationW'), pin - outputW);

	// The plot redrew for the new rail, still with both loads and the chosen point.
	await expect(plot.locator('path[data-series="4 Ω"]')).not.toHaveAttribute('d', before4 ?? '');
	await expect(plot.locator('path[data-series="8 Ω"]')).toHaveCount(1);
	await expect(plot.locator('[data-series="Your rails into 4 Ω"]')).toHaveCount(1);

	// More than the rails can give: a clear inline error on that field, the other results stay.
	await page.getByLabel('Output power to evaluate (optional)', { exact: true }).fill('500');
	await expect(page.getByText(/is above the .* these rails can give/)).toBeVisible();
	await expect(page.getByLabel('Output power to evaluate (optional)', { exact: true })).toHaveAttribute('aria-invalid', 'true');
	await expectShown(page.getByTestId('maxPowerW'), vpk ** 2 / (2 * load));
	await expect(page.getByTestId('supplyPowerW')).toHaveCount(0);

	// Undecodable input never crashes the page.
	await page.getByLabel('Load', { exact: true }).fill('4x7');
	await expect(page.getByRole('alert').filter({ hasText: '4x7' })).toBeVisible();
	await expect(page.getByLabel('Load', { exact: true })).toHaveAttribute('aria-invalid', 'true');
	await page.getByLabel('Load', { exact: true }).fill('8');
	await expectShown(page.getByTestId('maxPowerW'), vpk ** 2 / (2 * 8));
	await expectSamePage(page);
});

test('trade notation in the gain and series/parallel tools', async ({ page }) => {
	await page.goto('/tools/gain');
	await markPage(page);
	// 47k and 2k2: Av = 1 + 47 000 / 2 200.
	await typeLive(page, 'Rf (output to inverting input)', '47k', async () => {
		await expectShown(page.getByTestId('gain'), 1 + 47_000 / 1_000, 4);
	});
	await page.getByLabel('Ri (inverting input to ground)', { exact: true }).fill('2k2');
	const av = 1 + 47_000 / 2_200;
	await expectShown(page.getByTestId('gain'), av, 4);
	await expectShown(page.getByTestId('gainDb'), 20 * Math.log10(av), 4);
	// Input corner 1/(2π · 22 kΩ · 470 nF).
	await page.getByLabel('Cin (series input capacitor)', { exact: true }).fill('470n');
	await expectShown(page.getByTestId('inputCornerHz'), 1 / (2 * Math.PI * 22_000 * 470e-9));
	await expectSamePage(page);

	await page.goto('/tools/network');
	await markPage(page);
	await typeLive(page, 'Part 1', '10k', async () => {
		await expectShown(page.getByTestId('networkValue'), 1 / (1 / 10_000 + 1 / 4_700) / 1000);
	});
	await page.getByLabel('Joined in', { exact: true }).selectOption('series');
	await expectShown(page.getByTestId('networkValue'), (10_000 + 4_700) / 1000);
	await expect(page.getByTestId('networkValue')).toContainText('kΩ');
	await expectSamePage(page);
});

test('codes tool decodes 474K as 470 nF ±10 %', async ({ page }) => {
	await page.goto('/tools/codes');
	// 474K: 47 × 10⁴ pF, K = ±10 %.
	const nF = (47 * 10 ** 4) / 1000;
	await typeLive(page, 'Marking', '103', async () => {
		await expect(page.getByTestId('decoded')).toHaveText(`${(10 * 10 ** 3) / 1000} nF`);
	});
	await page.getByLabel('Marking', { exact: true }).fill('474K');
	await expect(page.getByTestId('decoded')).toHaveText(`${nF} nF`);
	await expect(page.getByTestId('decodedTolerance')).toHaveText('±10 %');
	// A potentiometer's taper letter is reported as ambiguous, not guessed.
	await page.getByLabel('Marking', { exact: true }).fill('A104');
	await expect(page.getByTestId('taper')).toContainText('A');
	await expect(page.getByTestId('taperNote')).toContainText(/linear/i);
	await expect(page.getByTestId('taperNote')).toContainText(/log/i);
	// Nonsense gets a sentence, not a crash.
	await page.getByLabel('Marking', { exact: true }).fill('QQQ');
	await expect(page.locator('#code-err')).toBeVisible();
});

test('supply tool shows the mains caution and ripple follows the reservoir', async ({ page }) => {
	await page.goto('/tools/supply');
	const caution = page.locator('[data-caution]');
	await expect(caution).toContainText('Mains voltage');
	await expect(caution).toContainText(/defer to local codes and licensed practice/i);
	await expect(page.getByRole('img', { name: /Ripple against reservoir capacitance/ })).toBeVisible();

	// Full wave at 50 Hz: ripple = I / (2 · 50 · C).
	const amps = 3;
	await typeLive(page, 'Load current per rail', String(amps), async () => {
		await expectShown(page.getByTestId('rippleVpp'), amps / (2 * 50 * 10_000e-6));
	});
	await page.getByLabel('Reservoir per rail', { exact: true }).fill('4700u');
	await expectShown(page.getByTestId('rippleVpp'), amps / (2 * 50 * 4_700e-6));
	// Unloaded rail of a 25 V winding, one 0.8 V diode per rail: √2 · 25 − 0.8.
	await expectShown(page.getByTestId('peakDcV'), Math.SQRT2 * 25 - 0.8);
	// Under load: the winding carries 1.8 × the DC load current (transformer makers' capacitor-input table).
	await expectShown(page.getByTestId('secondaryRmsA'), 1.8 * amps);
	await expect(page.getByRole('img', { name: /Rail against output power/ })).toBeVisible();
});

test('the address follows the inputs, and parts come and go without a reload', async ({ page }) => {
	await page.goto('/tools/amplifier');
	await markPage(page);
	await typeLive(page, 'Rail voltage (each side, ±)', '28', async () => {
		await expectShown(page.getByTestId('maxPowerW'), (28 - 3) ** 2 / (2 * 8));
	});
	// The address now holds the inputs: opened elsewhere it shows the same result.
	await expect(page).toHaveURL(/[?&]railV=28(&|$)/);
	await expectSamePage(page);

	// A select that brings a field: the heatsink's own case-to-sink figure.
	await page.goto('/tools/heatsink');
	await markPage(page);
	await expect(page.getByLabel('Rth case–sink', { exact: true })).toHaveCount(0);
	await expect(async () => {
		await page.getByLabel('Mounting and insulator (Rth case–sink)').selectOption('custom');
		await expect(page.getByLabel('Rth case–sink', { exact: true })).toBeVisible({ timeout: 2000 });
	}).toPass({ timeout: 15_000 });
	await expectSamePage(page);

	// Series/parallel: add a part, type into it, remove the first one.
	await page.goto('/tools/network');
	await markPage(page);
	await expect(async () => {
		await page.getByRole('button', { name: 'Add a part' }).click();
		await expect(page.getByLabel('Part 3', { exact: true })).toBeVisible({ timeout: 2000 });
	}).toPass({ timeout: 15_000 });
	await expect(page.getByLabel('Part 3', { exact: true })).toBeFocused();
	await page.getByLabel('Part 3', { exact: true }).fill('10k');
	// 4k7 ∥ 4k7 ∥ 10k.
	await expectShown(page.getByTestId('networkValue'), 1 / (2 / 4_700 + 1 / 10_000) / 1000);
	await page.getByRole('button', { name: 'Remove part 1' }).click();
	await expect(page.getByLabel('Part 3', { exact: true })).toHaveCount(0);
	await expect(page.getByLabel('Part 2', { exact: true })).toHaveValue('10k');
	await expectShown(page.getByTestId('networkValue'), 1 / (1 / 4_700 + 1 / 10_000) / 1000);
	await expect(page).not.toHaveURL(/remove=|add=/);
	await expectSamePage(page);
});

test.describe('without JavaScript', () => {
	test.use({ javaScriptEnabled: false });

	test('amplifier: Calculate answers the results, and the address shares them', async ({ page }) => {
		await page.goto('/tools/amplifier');
		await expectShown(page.getByTestId('maxPowerW'), (35 - 3) ** 2 / (2 * 8));
		await page.getByLabel('Rail voltage (each side, ±)', { exact: true }).fill('28');
		await page.getByLabel('Load', { exact: true }).fill('4');
		await page.getByRole('button', { name: 'Calculate' }).click();
		await expect(page).toHaveURL(/railV=28/);
		// (28 − 3)² / (2 · 4) and the worst-case class B dissipation 2 · 28² / (π² · 4).
		await expectShown(page.getByTestId('maxPowerW'), (28 - 3) ** 2 / (2 * 4));
		await expectShown(page.getByTestId('worstDissipationW'), (2 * 28 ** 2) / (Math.PI ** 2 * 4));
		await expect(page.getByLabel('Load', { exact: true })).toHaveValue('4');
		const plot = page.getByRole('img', { name: /Maximum sine power against rail voltage/ });
		await expect(plot.locator('[data-series="Your rails into 4 Ω"]')).toHaveCount(1);

		// The same address in a fresh page: the same results.
		const shared = page.url();
		await page.goto('/tools/amplifier');
		await page.goto(shared);
		await expectShown(page.getByTestId('maxPowerW'), (28 - 3) ** 2 / (2 * 4));

		// Nonsense in the address: the field says so, an unknown choice falls back, never an error page.
		const res = await page.goto('/tools/amplifier?supply=bogus&loadOhm=4x7&railV=%00');
		expect(res?.status()).toBe(200);
		await expect(page.getByRole('alert').filter({ hasText: '4x7' })).toBeVisible();
		await expect(page.getByLabel('Load', { exact: true })).toHaveAttribute('aria-invalid', 'true');
		await expect(page.getByLabel('Supply', { exact: true })).toHaveValue('split');
	});

	test('supply, codes and series/parallel work from the address and the buttons', async ({ page }) => {
		// Full wave at 50 Hz: ripple = I / (2 · 50 · C).
		await page.goto('/tools/supply?loadCurrentA=3&capacitanceF=4700u');
		await expectShown(page.getByTestId('rippleVpp'), 3 / (2 * 50 * 4_700e-6));
		await expect(page.getByRole('img', { name: /Ripple against reservoir capacitance/ })).toBeVisible();

		// 103: 10 × 10³ pF.
		await page.goto('/tools/codes?code=103');
		await expect(page.getByTestId('decoded')).toHaveText('10 nF');

		await page.goto('/tools/network');
		await page.getByRole('button', { name: 'Add a part' }).click();
		await expect(page).not.toHaveURL(/add=/);
		await page.getByLabel('Part 3', { exact: true }).fill('10k');
		await page.getByLabel('Joined in', { exact: true }).selectOption('series');
		await page.getByRole('button', { name: 'Calculate' }).click();
		await expectShown(page.getByTestId('networkValue'), (4_700 + 4_700 + 10_000) / 1000);
		await page.getByRole('button', { name: 'Remove part 1' }).click();
		await expect(page.getByLabel('Part 3', { exact: true })).toHaveCount(0);
		await expectShown(page.getByTestId('networkValue'), (4_700 + 10_000) / 1000);
		await expect(page.getByLabel('Joined in', { exact: true })).toHaveValue('series');
	});
});

test('reached from a page with the framework, a tool loads from the server and stays live', async ({ page }) => {
	await page.goto('/builds');
	await markPage(page);
	await page.getByRole('banner').getByRole('link', { name: 'Bench tools' }).first().click();
	await expect(page).toHaveURL(/\/tools$/);
	// A full load (the mark is gone): the tools page carries no framework to navigate with.
	await expect(async () => {
		expect(await page.evaluate(() => (window as unknown as { __toolMark?: number }).__toolMark)).toBeUndefined();
	}).toPass({ timeout: 15_000 });
	await page.getByRole('link', { name: /Amplifier power and dissipation/ }).click();
	await expect(page).toHaveURL(/\/tools\/amplifier$/);
	await markPage(page);
	await typeLive(page, 'Load', '4', async () => {
		await expectShown(page.getByTestId('maxPowerW'), (35 - 3) ** 2 / (2 * 4));
	});
	await expectSamePage(page);
	await page.goBack();
	await expect(page).toHaveURL(/\/tools$/);
	await page.goBack();
	await expect(page).toHaveURL(/\/builds$/);
});

test('when the server cannot be reached, the results stay and say they are for earlier inputs', async ({ page }) => {
	await page.goto('/tools/gain');
	await markPage(page);
	const offline = page.getByText(/Could not reach Starground/);
	await expect(offline).toBeHidden();
	// Cut the tool's own requests (the live updates), as a dropped connection would.
	await page.route((url) => url.pathname === '/tools/gain', (route) => route.abort('internetdisconnected'));
	await page.getByLabel('Rf (output to inverting input)', { exact: true }).fill('47k');
	await expect(offline).toBeVisible();
	// 1 + 22k / 1k: still the earlier inputs' gain.
	await expectShown(page.getByTestId('gain'), 1 + 22_000 / 1_000, 4);
	await page.unrouteAll();
	await page.getByLabel('Ri (inverting input to ground)', { exact: true }).fill('2k2');
	await expectShown(page.getByTestId('gain'), 1 + 47_000 / 2_200, 4);
	await expect(offline).toBeHidden();
	await expectSamePage(page);
});

test('a tool page loads its live script, versioned by its address and kept a year, and no framework', async ({ request }) => {
	const html = await (await request.get('/tools/supply')).text();
	const srcs = [...html.matchAll(/<script[^>]*\ssrc="([^"]+)"/g)].map((m) => m[1]);
	// The live script once; besides it at most small site-wide scripts, never the framework (entry, chunks, nodes).
	const live = srcs.filter((src) => src.startsWith('/tools/live.js'));
	expect(live).toHaveLength(1);
	expect(live[0]).toMatch(/^\/tools\/live\.js\?v=[0-9a-f]{16}$/);
	expect(html).not.toMatch(/_app\/immutable\/(entry|chunks|nodes)\//); // no modulepreload either
	const script = await request.get(live[0]);
	expect(script.status()).toBe(200);
	expect(script.headers()['content-type']).toContain('text/javascript');
	expect(script.headers()['cache-control']).toContain('immutable');
	expect(await script.text()).toContain('data-live-root');
	// Any other version's address answers the current text, revalidated each time.
	expect((await request.get('/tools/live.js?v=0000000000000000')).headers()['cache-control']).toBe('public, no-cache');
});
