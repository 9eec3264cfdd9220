// Fills the sign-in form as a person would, after the page has settled: the e-mail field takes
// focus when the form mounts (autofocus), and on a loaded machine that can happen after a test
// has started typing the password, sending the password into the e-mail field. So wait for
// that focus first, then check what the fields hold before submitting.
import type { Page } from 'playwright-core';

export async function fillSignInForm(page: Page, email: string, password: string): Promise<void> {
  const emailField = page.getByLabel('E-mail address');
  const passwordField = page.getByLabel('Password');
  await emailField.waitFor();
  await page.waitForFunction(() => document.activeElement instanceof HTMLInputElement && document.activeElement.type === 'email');
  await emailField.fill(email);
  await passwordField.fill(password);
  if ((await emailField.inputValue()) !== email || (await passwordField.inputValue()) !== password) {
    throw new Error('the sign-in form did not keep what was typed');
  }
}

export async function signInThroughForm(page: Page, email: string, password: string): Promise<void> {
  await fillSignInForm(page, email, password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}
