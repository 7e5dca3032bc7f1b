import { expect, type Page } from '@playwright/test';

/**
 * On a build's parts editor: paste `text` as CSV, preview it, check that all `count` lines are read, and save them
 * (`replace` the list or `append` to its end).
 */
export async function importCsv(page: Page, text: string, mode: 'replace' | 'append', count: number): Promise<void> {
	await page.getByLabel('…or paste the CSV text').fill(text);
	await page.getByLabel('Then').selectOption(mode);
	await page.getByRole('button', { name: 'Preview' }).click();
	await expect(page.getByText(`All ${count} line`)).toBeVisible();
	await page.getByRole('button', { name: `Save these ${count} line` }).click();
	await expect(page.getByText(`Imported and saved: ${count} line`)).toBeVisible();
}

/** Fill form fields by (a part of) their labels, in order: fillByLabel(page, { Title: 'Supply', Channels: '2' }). */
export async function fillByLabel(page: Page, fields: Record<string, string>): Promise<void> {
	for (const [label, value] of Object.entries(fields)) await page.getByLabel(label).fill(value);
}

/** The header of a costed parts-list CSV as the import reads it (RFC 4180; the export adds value_si, unit, deviation_pct). */
export const COSTED_CSV_HEADER =
	'designators,quantity,kind,value,tolerance_pct,rating_v,rating_w,package,notes,design_value,substitution_reason,mpn,supplier,unit_price,currency,per_channel';
