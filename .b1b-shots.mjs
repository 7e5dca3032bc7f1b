import { chromium } from '@playwright/test';
const base = 'http://127.0.0.1:5212';
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox','--disable-gpu','--disable-background-networking','--disable-component-update','--disable-sync','--no-first-run','--disable-quic'] });
for (const [name, vp] of [['desktop', { width: 1280, height: 900 }], ['phone', { width: 390, height: 844 }]]) {
  const ctx = await browser.newContext({ viewport: vp, baseURL: base });
  const page = await ctx.newPage();
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill('joss@starground.test');
  await page.getByLabel('Password').fill('bench-demo-2026');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('button', { name: 'Sign out' }).waitFor();
  for (const path of (process.argv[2] ?? '/builds/bench-stereo-chip-amp').split(',')) {
    await page.goto(path);
    await page.waitForTimeout(800);
    const f = `/tmp/shots-b1b/${path.replace(/\W+/g, '_')}-${name}.png`;
    await page.screenshot({ path: f, fullPage: process.argv[3] === 'full' });
    console.log(f);
  }
  await ctx.close();
}
await browser.close();
