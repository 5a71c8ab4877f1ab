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

export class RunsList {
  constructor(private page: Page) {}

  table() {
    return this.page.getByTestId('runs-table');
  }

  async runCodes(): Promise<string[]> {
    return this.page.locator('tr[data-run-code]').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-run-code') ?? ''));
  }

  async open(runCode: string): Promise<void> {
    await this.page.locator(`tr[data-run-code="${runCode}"]`).getByRole('link', { name: runCode }).click();
  }
}

export class RunView {
  constructor(private page: Page) {}

  async switchTo(label: 'Joint re-fit' | 'Layer by layer'): Promise<void> {
    await this.page.getByRole('navigation', { name: 'Analysis' }).getByRole('link', { name: label }).click();
  }

  currentMode() {
    return this.page.getByRole('navigation', { name: 'Analysis' }).locator('[aria-current="page"]');
  }

  layerRows() {
    return this.page.getByTestId('layer-table').locator('tbody tr');
  }

  advisory() {
    return this.page.getByTestId('advisory');
  }
}

export class DesignsList {
  constructor(private page: Page) {}

  async open(nameContains: string): Promise<void> {
    await this.page.locator(`tr[data-design*="${nameContains}"]`).getByRole('link').click();
  }

  async importFile(fileName: string, contents: string): Promise<void> {
    await this.page.getByLabel('Design file (fringelog.design/1, .json)').setInputFiles({ name: fileName, mimeType: 'application/json', buffer: Buffer.from(contents) });
    await this.page.getByRole('button', { name: 'Import' }).click();
  }

  importError() {
    return this.page.locator('[data-field-error="file"]');
  }
}

export class DesignView {
  constructor(private page: Page) {}

  planRows() {
    return this.page.getByTestId('cut-plan').locator('tbody tr');
  }

  revisions() {
    return this.page.getByTestId('revisions').locator('li');
  }

  async revisionNumbers(): Promise<number[]> {
    return this.page.locator('[data-revision]').evaluateAll((els) => els.map((e) => Number(e.getAttribute('data-revision'))));
  }

  exportHref() {
    return this.page.getByRole('link', { name: 'Export JSON' }).getAttribute('href');
  }
}

export class DesignEditorPage {
  constructor(private page: Page) {}

  thickness(layer: number) {
    return this.page.getByLabel(`Thickness of layer ${layer}`, { exact: true });
  }

  async save(): Promise<void> {
    await this.page.getByRole('button', { name: 'Save as a new revision' }).click();
  }

  fieldErrors() {
    return this.page.getByTestId('design-editor').locator('[data-field-error]');
  }
}
