import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_PASSWORD, E2E_BASE, SHOTS, useBrowser } from '../support/e2e';
import { linkIn, waitForMail } from '../support/mail';

const base = E2E_BASE;
const PASSWORD = DEMO_PASSWORD;
const browser = useBrowser();

/** Do something that submits a form (a full page load, no script), then wait for the new page. */
async function submits(page: Page, action: () => Promise<void>) {
  await page.evaluate(() => ((window as unknown as { __old?: boolean }).__old = true));
  await action();
  await page.waitForFunction(() => !(window as unknown as { __old?: boolean }).__old);
  await page.waitForLoadState('domcontentloaded');
}

async function signInWithKeyboard(page: Page, email: string, password: string) {
  await page.goto(base + '/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.keyboard.press('Tab');
  await page.keyboard.type(password);
  await submits(page, () => page.keyboard.press('Enter'));
}

const nav = (page: Page) => page.locator('nav[aria-label="Main"] a').allInnerTexts();

describe('sign-in in Chromium', () => {
  const expected: Record<string, { nav: string[]; lands: string }> = {
    designer: { nav: ['Projects', 'Orders'], lands: '/projects' },
    engineer: { nav: ['Projects', 'Orders', 'Review', 'Shop'], lands: '/review' },
    machinist: { nav: ['Shop'], lands: '/shop' },
    admin: { nav: ['Projects', 'Orders', 'Review', 'Shop', 'Admin'], lands: '/admin/users' },
  };

  for (const [role, want] of Object.entries(expected)) {
    it(`signs in as the demo ${role} through the form and sees only the ${role}'s sections`, async () => {
      const context = await browser().newContext();
      const page = await context.newPage();
      await signInWithKeyboard(page, `${role}@example.test`, PASSWORD);
      expect(new URL(page.url()).pathname).toBe(want.lands);
      expect(await nav(page)).toEqual(want.nav);
      await expect(page.getByTestId('who-role').innerText()).resolves.toBe(role);
      const cookies = await context.cookies();
      const session = cookies.find((c) => c.name === 'platewright_session');
      expect(session?.httpOnly).toBe(true);
      expect(session?.sameSite).toBe('Lax');
      expect(await page.evaluate(() => document.cookie)).not.toContain('platewright_session');

      // Sign out from the header.
      await submits(page, () => page.getByRole('button', { name: 'Sign out' }).click());
      expect(page.url()).toBe(`${base}/sign-in?signed_out=1`);
      await expect(page.getByTestId('notice').innerText()).resolves.toBe('You are signed out.');
      expect(await nav(page)).toEqual(['Projects', 'Orders', 'Review', 'Shop', 'Admin']);
      await context.close();
    });
  }

  it('shows a wrong password inline, keeps the e-mail, and puts the cursor back in the password field', async () => {
    const page = await browser().newPage();
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.goto(base + '/sign-in');
    await page.screenshot({ path: `${SHOTS}/sign-in.png`, fullPage: true });
    await signInWithKeyboard(page, 'designer@example.test', 'not-the-demo-password');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    const alert = page.getByRole('alert');
    await expect(alert.innerText()).resolves.toBe('That e-mail and password do not match an active Platewright account.');
    expect(await page.getByLabel('E-mail').inputValue()).toBe('designer@example.test');
    expect(await page.getByLabel('Password').inputValue()).toBe('');
    expect(await page.evaluate(() => document.activeElement?.getAttribute('name'))).toBe('password');
    expect(await nav(page)).toEqual(['Projects', 'Orders', 'Review', 'Shop', 'Admin']); // still anonymous
    await page.screenshot({ path: `${SHOTS}/sign-in-error.png`, fullPage: true });
    await page.close();
  });

  it('sends an anonymous visitor to sign-in and back to the page they asked for', async () => {
    const page = await browser().newPage();
    await page.goto(base + '/account');
    expect(page.url()).toBe(`${base}/sign-in?next=%2Faccount`);
    await page.getByLabel('E-mail').fill('machinist@example.test');
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`${base}/account`);
    await expect(page.locator('h1').innerText()).resolves.toBe('Your account');
    await page.screenshot({ path: `${SHOTS}/account.png`, fullPage: true });
    // A page for another role shows the 403 page.
    const r = await page.goto(base + '/admin/users');
    expect(r?.status()).toBe(403);
    await expect(page.getByTestId('forbidden').innerText()).resolves.toMatch(/for the role admin.*signed in as Mo Treadwell, role machinist/s);
    await page.screenshot({ path: `${SHOTS}/forbidden.png`, fullPage: true });
    await page.close();
  });

  it('admin: users table, invite someone, read the mail, accept as the newcomer', async () => {
    const admin = await browser().newContext();
    const page = await admin.newPage();
    await page.setViewportSize({ width: 1400, height: 900 });
    await signInWithKeyboard(page, 'admin@example.test', PASSWORD);
    const table = page.getByTestId('users-table');
    for (const email of ['designer@example.test', 'engineer@example.test', 'machinist@example.test', 'admin@example.test']) {
      await expect(table.locator(`tr[data-email="${email}"]`).count()).resolves.toBe(1);
    }
    await page.screenshot({ path: `${SHOTS}/admin-users.png`, fullPage: true });

    const email = `e2e-invite-${Date.now()}@example.test`;
    await page.locator('#invite-email').fill(email);
    await page.locator('#invite-role').selectOption('engineer');
    await submits(page, () => page.getByTestId('invite-submit').click());
    await expect(page.getByTestId('notice').innerText()).resolves.toContain(`Invitation sent to ${email} as engineer`);
    await expect(page.getByTestId('invites-table').innerText()).resolves.toContain(email);

    await page.goto(base + '/admin/mail');
    await expect(page.getByTestId('mail-item').first().innerText()).resolves.toContain(email);
    await page.screenshot({ path: `${SHOTS}/admin-mail.png`, fullPage: true });

    const link = linkIn(await waitForMail(email), base, '/invite/');
    const newcomer = await browser().newContext();
    const np = await newcomer.newPage();
    await np.goto(link);
    await np.screenshot({ path: `${SHOTS}/invite.png`, fullPage: true });
    await np.getByLabel('Your name').fill('Oriel Fenwick');
    await np.getByLabel('Password', { exact: true }).fill('Newcomer-Password-1');
    await np.getByLabel('Password again').fill('Newcomer-Password-1');
    await np.getByTestId('accept-submit').click();
    await np.waitForURL(`${base}/review`);
    await expect(np.getByTestId('who-name').innerText()).resolves.toBe('Oriel Fenwick');
    await expect(np.getByTestId('who-role').innerText()).resolves.toBe('engineer');

    // Back as admin: the newcomer is in the table; deactivate them.
    await page.goto(base + '/admin/users');
    const row = page.locator(`tr[data-email="${email}"]`);
    await submits(page, () => row.getByRole('button', { name: 'Deactivate Oriel Fenwick' }).click());
    await expect(page.getByTestId('notice').innerText()).resolves.toBe('Oriel Fenwick is deactivated and was signed out everywhere.');
    await np.reload();
    expect(await np.getByTestId('who-name').count()).toBe(0);
    await newcomer.close();
    await admin.close();
  });
});
