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

  plot() {
    return this.page.getByTestId('trace-plot');
  }

  /** The plot's visible time range, s (kept on the plot's element as data-view-from/to). */
  async view(): Promise<[number, number]> {
    const el = this.plot();
    return [Number(await el.getAttribute('data-view-from')), Number(await el.getAttribute('data-view-to'))];
  }

  async showLayer(layer: number): Promise<void> {
    await this.page.getByTestId('layer-table').getByRole('button', { name: `Show layer ${layer} on the trace` }).click();
  }

  async pinNoteAtPlotCentre(text: string): Promise<void> {
    await this.page.getByRole('button', { name: 'Pin a note' }).click();
    const box = await this.plot().locator('.u-over').first().boundingBox();
    if (!box) throw new Error('the trace plot is not drawn');
    await this.page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    const note = this.page.getByTestId('annotation-form').getByLabel('Note');
    await note.fill(text);
    await this.page.getByRole('button', { name: 'Pin note' }).click();
  }

  annotationForm() {
    return this.page.getByTestId('annotation-form');
  }

  disposition() {
    return this.page.getByTestId('disposition');
  }

  async decide(word: string, reason: string): Promise<void> {
    await this.page.getByRole('button', { name: /Decide the disposition|Change the disposition/ }).click();
    await this.disposition().getByLabel(word).check();
    await this.disposition().getByLabel('Reason (required)').fill(reason);
    await this.page.getByRole('button', { name: 'Record the disposition' }).click();
  }
}

export class ComparePage {
  constructor(private page: Page) {}

  /** The by-shift or by-chamber table's row of a layer. */
  groupRow(by: 'shift' | 'chamber', layer: number) {
    return this.page.getByTestId(`compare-by-${by}`).locator(`tbody tr[data-layer="${layer}"]`);
  }

  async groupHeaders(by: 'shift' | 'chamber'): Promise<string[]> {
    return (await this.page.getByTestId(`compare-by-${by}`).locator('thead th').allTextContents()).map((s) => s.trim());
  }

  async tick(name: string): Promise<void> {
    await this.page.getByTestId('compare-filters').getByLabel(name, { exact: true }).check();
  }

  async choose(label: string, option: string): Promise<void> {
    await this.page.getByTestId('compare-filters').getByLabel(label).selectOption({ label: option });
  }

  async show(): Promise<void> {
    await this.page.getByTestId('compare-filters').getByRole('button', { name: 'Show' }).click();
  }

  ruleSignals() {
    return this.page.getByTestId('rule-signals');
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
