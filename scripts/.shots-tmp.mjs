import { chromium } from '@playwright/test';
const base = process.env.BASE ?? 'http://127.0.0.1:5299';
const out = process.env.OUT ?? '/tmp/shots-lead';
const pages = (process.env.PAGES ?? '/').split(',');
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox','--disable-gpu','--disable-background-networking','--disable-component-update','--disable-sync','--no-first-run','--disable-quic'] });
import fs from 'node:fs'; fs.mkdirSync(out, { recursive: true });
for (const [w, h, tag] of [[1280, 900, 'desk'], [390, 844, 'phone']]) {
  const ctx = await browser.newContext({ viewport: { width: w, height: h } });
  const page = await ctx.newPage();
  if (process.env.LOGIN) {
    await page.goto(base + '/sign-in'); await page.getByLabel('E-mail').fill(process.env.LOGIN); await page.getByLabel('Password').fill('bench-demo-2026');
    await page.getByRole('button', { name: 'Sign in' }).click(); await page.waitForLoadState('networkidle');
  }
  for (const p of pages) {
    await page.goto(base + p, { waitUntil: 'networkidle', timeout: 120000 });
    const name = p.replace(/[^a-z0-9]+/gi, '_') || 'home';
    await page.screenshot({ path: `${out}/${tag}${name}.png`, fullPage: true });
  }
  await ctx.close();
}
await browser.close();
