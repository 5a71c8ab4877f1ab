import type { Page } from 'playwright-core';

/** Page objects: what a person sees and does, in the app's own words. */
export class SignInPage {
  constructor(
    private page: Page,
    private baseUrl: string,
  ) {}

  async open(): Promise<void> {
    await this.page.goto(`${this.baseUrl}/sign-in`);
  }

  async signIn(email: string, password: string): Promise<void> {
    await this.page.getByLabel('E-mail').fill(email);
    await this.page.getByLabel('Password', { exact: true }).fill(password);
    await this.page.getByRole('button', { name: 'Sign in' }).click();
  }

  fieldError(field: string) {
    return this.page.locator(`[data-field-error="${field}"]`);
  }
}

export class Shell {
  constructor(private page: Page) {}

  async navLabels(): Promise<string[]> {
    return (await this.page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).map((s) => s.trim());
  }

  async userName(): Promise<string> {
    return (await this.page.getByTestId('user-name').textContent())?.trim() ?? '';
  }

  async go(label: string): Promise<void> {
    await this.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: label, exact: true }).click();
  }

  async signOut(): Promise<void> {
    await this.page.getByRole('button', { name: 'Sign out' }).click();
    await this.page.waitForURL(/\/sign-in/);
  }
}
