import { describe, expect, it } from 'vitest';
import { E2E_BASE, hydrated, SHOTS, signInThroughForm, useBrowser } from '../support/e2e';
import { formatMoney } from '../../src/domain/quote/money';

const base = E2E_BASE;
const PAYMENTS = process.env.PAYMENTS_API_BASE ?? '';
const browser = useBrowser();

const signedIn = (email: string) => signInThroughForm(browser(), email, { viewport: { width: 1366, height: 900 } });


describe('made-to-order plate in Chromium', () => {
  it('designer quotes PW-0001 rev 3, accepts, pays on the checkout page, sees it paid; the shop sees it queued', async () => {
    const designer = await signedIn('designer@example.test');
    const d = designer.page;

    // to the demo plate through the projects screens, as a person would
    await d.goto(base + '/projects');
    await Promise.all([d.waitForURL(/\/projects\/\d+$/), d.getByRole('link', { name: 'Fennick coupe swap' }).first().click()]);
    await Promise.all([d.waitForURL(/\/plates\/\d+/), d.getByRole('link', { name: 'PW-0001' }).click()]);
    await expect(d.getByRole('heading', { name: /Revision 3/ }).innerText()).resolves.toMatch(/Released/);

    const section = d.locator('#quote');
    await section.scrollIntoViewIfNeeded();
    await hydrated(d);
    await section.getByLabel('Plates').fill('2');
    await section.getByRole('button', { name: 'Request a quote' }).click();
    const quote = section.getByTestId('quote');
    await quote.waitFor();
    const reference = await quote.getAttribute('data-quote');
    expect(reference).toMatch(/^Q-\d{5}$/);
    const linesText = await quote.getByTestId('quote-lines').innerText();
    expect(linesText).toMatch(/Material: 6061/);
    expect(linesText).toMatch(/g\/cm³/); // the arithmetic is shown
    expect(linesText).toMatch(/Plates × 2/);
    const totalText = (await quote.getByTestId('quote-total').innerText()).trim();
    await quote.screenshot({ path: `${SHOTS}/orders-1-quote.png` });

    // the same quote over the API, to compare the shown total with the stored minor units
    const plateId = Number(new URL(d.url()).pathname.split('/').pop());
    const revs = await (await d.request.get(`${base}/api/plates/${plateId}/revisions`)).json();
    const rev3 = revs.revisions.find((r: { number: number }) => r.number === 3);
    const stored = (await (await d.request.get(`${base}/api/revisions/${rev3.id}/quotes`)).json()).quotes.find((q: { reference: string }) => q.reference === reference);
    expect(stored.quantity).toBe(2);
    expect(Number.isInteger(stored.totals.totalMinor)).toBe(true);
    expect(totalText).toBe(formatMoney(stored.totals.totalMinor, stored.currency, stored.currencyMinorDigits));

    // accept: off to the payment page on the local fake
    await Promise.all([d.waitForURL((u) => u.href.startsWith(`${PAYMENTS}/pay/`)), quote.getByRole('button', { name: 'Accept and pay' }).click()]);
    expect(await d.getByTestId('fake-total').innerText()).toBe(totalText);
    await d.screenshot({ path: `${SHOTS}/orders-2-checkout.png`, fullPage: true });

    // decline first: nothing is charged, and the order stays awaiting payment
    await d.getByRole('button', { name: 'Decline' }).click();
    await d.getByRole('heading', { name: 'Card declined' }).waitFor();
    await d.goto(base + '/orders');
    const pending = d.locator('article[data-order]').first();
    await expect(pending.getAttribute('data-state')).resolves.toBe('awaiting_payment');
    await expect(pending.innerText()).resolves.toMatch(/declined/);

    // pay: back to the orders page, paid
    await Promise.all([d.waitForURL(/\/plates\/\d+/), pending.getByRole('link', { name: 'Continue to payment' }).click()]);
    await d.locator('#quote').scrollIntoViewIfNeeded();
    await hydrated(d);
    await Promise.all([d.waitForURL((u) => u.href.startsWith(`${PAYMENTS}/pay/`)), d.locator('#quote').getByRole('button', { name: 'Continue to payment' }).click()]);
    await Promise.all([d.waitForURL((u) => u.pathname === '/orders'), d.getByRole('button', { name: /^Pay / }).click()]);
    await expect(d.getByTestId('payment-banner').innerText()).resolves.toMatch(/payment received/i);
    const order = d.locator('article[data-order]').first();
    await expect(order.getAttribute('data-state')).resolves.toBe('paid');
    const orderRef = await order.getAttribute('data-order');
    await d.screenshot({ path: `${SHOTS}/orders-3-paid.png`, fullPage: true });

    // the shop: the order is in the queue, and the machinist starts production
    const machinist = await signedIn('machinist@example.test');
    const m = machinist.page;
    await m.goto(base + '/shop/orders');
    await hydrated(m);
    const row = m.getByTestId('shop-orders').locator(`tr[data-order="${orderRef}"]`);
    await expect(row.innerText()).resolves.toMatch(/PW-0001/);
    await expect(row.locator('[data-order-state]').getAttribute('data-order-state')).resolves.toBe('paid');
    await row.getByRole('button', { name: 'Start production' }).click();
    await row.locator('[data-order-state="in_production"]').waitFor();
    await m.screenshot({ path: `${SHOTS}/orders-4-shop-queue.png`, fullPage: true });

    await designer.context.close();
    await machinist.context.close();
  });

  it('admins edit the shop rates; a wrong amount is refused with a message', async () => {
    const admin = await signedIn('admin@example.test');
    const a = admin.page;
    await a.goto(base + '/admin/shop');
    await hydrated(a);
    await a.getByLabel('Tax rate (%)').fill('nineteen');
    await a.getByRole('button', { name: 'Save rates' }).click();
    await expect(a.getByRole('alert').innerText()).resolves.toMatch(/Tax rate: "nineteen" is not a percentage/);
    await a.getByLabel('Tax rate (%)').fill('19');
    await a.getByRole('button', { name: 'Save rates' }).click();
    await expect(a.getByRole('status').innerText()).resolves.toMatch(/Saved/);
    await a.screenshot({ path: `${SHOTS}/orders-5-shop-rates.png`, fullPage: true });
    await admin.context.close();
  });
});
