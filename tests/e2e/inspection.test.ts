import { describe, expect, it } from 'vitest';
import { E2E_BASE, SHOTS, signInThroughForm, useBrowser } from '../support/e2e';
import { extractText, getDocumentProxy } from 'unpdf';

const base = E2E_BASE;
const browser = useBrowser();

const signedIn = (email: string) => signInThroughForm(browser(), email, { viewport: { width: 1500, height: 950 }, acceptDownloads: true });

interface PlanHole { id: string; nominal: { x: number; y: number }; size: { lowerMm: number; upperMm: number }; depth: { nominalMm: number } | null }

describe('inspection of the demo plate in Chromium', () => {
  it('machinist records PW-0001 rev 3 with one hole out of position → failed; engineer accepts with deviation; report names the hole', async () => {
    const { page: m } = await signedIn('machinist@example.test');
    await m.goto(base + '/shop');
    const card = m.locator('article[data-part="PW-0001"]');
    expect(await card.locator('h2').innerText()).toMatch(/PW-0001\s+rev 3/);
    await Promise.all([m.waitForURL(/\/shop\/inspections\?plate=\d+/), card.getByRole('link', { name: 'Start inspection' }).click()]);
    await Promise.all([m.waitForURL(/\/shop\/inspections\/\d+$/), m.getByRole('button', { name: 'Start inspection of rev 3' }).click()]);
    const id = Number(new URL(m.url()).pathname.split('/').pop());
    await m.locator('[data-testid="inspection-table"]').waitFor();

    // a bad CSV paste is refused line by line and changes nothing
    await m.getByText('Paste or upload a probe CSV').click();
    await m.getByLabel('CSV text').fill('id,x,y,diameter\nE1,119.5x,10.459,9\nNOPE,1,2,3\n');
    await m.getByRole('button', { name: 'Read CSV into the table' }).click();
    const errs = m.locator('[data-testid="row-errors"]');
    await expect(errs.innerText()).resolves.toMatch(/Line 2, x: "119\.5x" in column x is not a number/);
    await expect(errs.innerText()).resolves.toMatch(/Line 3, featureId: unknown feature id "NOPE"/);
    expect(await m.getByLabel('E1 measured X').inputValue()).toBe('');

    // the features and their nominals, as the page itself got them
    const plan = (await (await m.request.get(`${base}/api/inspections/${id}`)).json()).inspection.plan as { holes: PlanHole[]; thickness: { nominalMm: number } };
    expect(plan.holes.map((h) => h.id)).toContain('E3');
    const r3 = (v: number) => (Math.round(v * 1000) / 1000).toFixed(3);
    for (const h of plan.holes) {
      // E3 is drilled 0.12 mm off in X: TP = 2·0.12 = 0.24 > Ø0.10 zone
      await m.getByLabel(`${h.id} measured X`).fill(r3(h.nominal.x + (h.id === 'E3' ? 0.12 : 0.004)));
      await m.getByLabel(`${h.id} measured Y`).fill(r3(h.nominal.y - (h.id === 'E3' ? 0 : 0.003)));
      await m.getByLabel(`${h.id} measured diameter`).fill(r3((h.size.lowerMm + h.size.upperMm) / 2));
      if (h.depth) await m.getByLabel(`${h.id} measured depth`).fill(r3(h.depth.nominalMm));
    }
    for (const [i, d] of [0.01, -0.02, 0.015, 0].entries()) await m.getByLabel(`THK${i + 1} measured thickness`).fill(r3(plan.thickness.nominalMm + d));
    await m.getByLabel('FLAT flatness reading').fill('0.03');

    const e3 = m.locator('tr[data-feature="E3"]');
    expect(await e3.getAttribute('data-result')).toBe('fail');
    expect(await e3.innerText()).toMatch(/FAIL/);
    // TP from the typed (3-decimal) values: 2·√(Δx² + Δy²) with Δx ≈ 0.120, Δy ≈ 0 → ≈ 0.240
    const e3n = plan.holes.find((h) => h.id === 'E3')!.nominal;
    const tpE3 = 2 * Math.hypot(Number(r3(e3n.x + 0.12)) - e3n.x, Number(r3(e3n.y)) - e3n.y);
    expect(tpE3).toBeGreaterThan(0.239);
    expect(await e3.innerText()).toContain(tpE3.toFixed(3));
    expect(await m.locator('tr[data-feature="E2"]').innerText()).toMatch(/PASS/);
    expect(await m.locator('[data-testid="overall"]').innerText()).toMatch(/FAIL — out of tolerance: E3/);
    await m.screenshot({ path: `${SHOTS}/inspection-machinist-live.png`, fullPage: true });

    await m.getByRole('button', { name: 'Finish inspection' }).click();
    await m.getByText(/Inspection closed: Failed/).waitFor();
    expect(await m.getByTestId('state').innerText()).toBe('Failed');
    expect(await m.getByLabel('E1 measured X').isDisabled()).toBe(true);

    // engineer: the list shows it failed, the reason is required, then accepted
    const { page: e } = await signedIn('engineer@example.test');
    await e.goto(`${base}/shop`);
    await Promise.all([e.waitForURL(/\/shop\/inspections\?plate=/), e.locator('article[data-part="PW-0001"]').getByRole('link', { name: 'Inspections' }).click()]);
    const row = e.locator(`tr[data-inspection="${id}"]`);
    expect(await row.innerText()).toMatch(/FAILED[\s\S]*E3/);
    await e.screenshot({ path: `${SHOTS}/inspection-list.png`, fullPage: true });
    await Promise.all([e.waitForURL(new RegExp(`/shop/inspections/${id}$`)), row.getByRole('link', { name: `#${id}` }).click()]);
    await e.getByRole('button', { name: 'Accept with deviation' }).click();
    await e.getByRole('alert').filter({ hasText: /Comment/ }).waitFor();
    await e.getByLabel('Reason for accepting the deviation').fill('E3 is a clearance hole; the bolt still passes freely. Accepted for this part only.');
    await e.getByRole('button', { name: 'Accept with deviation' }).click();
    await e.getByText('Accepted with deviation. The designer gets the report by e-mail.').waitFor();
    expect(await e.getByTestId('state').innerText()).toBe('Accepted with deviation');
    expect(await e.getByTestId('overall').innerText()).toMatch(/ACCEPTED WITH DEVIATION — E3 out of tolerance[\s\S]*bolt still passes freely/);
    await e.screenshot({ path: `${SHOTS}/inspection-engineer-accepted.png`, fullPage: true });

    const pdf = await e.request.get(`${base}/api/inspections/${id}/report.pdf`);
    expect(pdf.status()).toBe(200);
    const { text } = await extractText(await getDocumentProxy(new Uint8Array(await pdf.body())), { mergePages: true });
    expect(text).toMatch(/E3 FAIL/);
    expect(text).toMatch(/Out of tolerance: E3/);
    expect(text).toMatch(/ACCEPTED WITH DEVIATION/);
    expect(text).toMatch(/bolt still passes freely/);
  });
});
