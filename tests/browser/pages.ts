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

export class UploadDeskPage {
  constructor(private page: Page) {}

  async choose(...files: string[]): Promise<void> {
    await this.page.getByTestId('trace-input').setInputFiles(files);
  }

  item(fileName: string) {
    return this.page.locator(`[data-testid="upload-item"][data-file="${fileName}"]`);
  }

  field(fileName: string, label: string) {
    return this.item(fileName).getByLabel(label, { exact: true });
  }

  async upload(fileName: string): Promise<void> {
    await this.item(fileName).getByRole('button', { name: 'Upload' }).click();
  }

  progress(fileName: string) {
    return this.item(fileName).getByRole('progressbar');
  }

  analysisStates(fileName: string) {
    return this.item(fileName).locator('[data-testid="analysis-watch"] li[data-state]');
  }

  error(fileName: string) {
    return this.item(fileName).getByTestId('upload-error');
  }
}
