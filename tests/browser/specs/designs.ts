import type { Page } from 'playwright-core';
import { baseUrl, assert, assertEqual, shot, signInAs, signInEngineer, test } from '../harness';
import { DesignEditorPage, DesignView, DesignsList, RunsList, Shell } from '../pages';

const phone = { width: 390, height: 844 };
const desktop = { width: 1280, height: 800 };

async function both(page: Page, name: string): Promise<void> {
  await shot(page, `${name}-desktop`);
  await page.setViewportSize(phone);
  await shot(page, `${name}-phone`);
  await page.setViewportSize(desktop);
}

test('an engineer reads the cut plan, edits a layer into a new revision, and an old run keeps its own', async (page) => {
  await signInEngineer(page);
  await new Shell(page).go('Designs');
  await page.getByRole('heading', { name: 'Designs', exact: true }).waitFor();
  await both(page, 'designs-list');
  await new DesignsList(page).open('LK-BB4');
  const view = new DesignView(page);
  await page.getByTestId('cut-plan').waitFor();
  assertEqual(await view.planRows().count(), 4, 'cut-plan rows of the four-layer AR');
  const firstRow = (await view.planRows().first().textContent()) ?? '';
  assert(/moves the cut by|nm ·/.test((await page.getByTestId('cut-plan').textContent()) ?? '') && firstRow.includes('at a level'), 'cut plan lists the level cut and its shift');
  assert((await page.getByTestId('advisory').textContent())?.includes('advisory'), 'advisory note beside the cut plan');
  assert(((await page.getByTestId('single-layer-rule').textContent()) ?? '').includes('Macleod'), 'the rule names its source');
  await page.getByTestId('spectrum').locator('canvas').first().waitFor();
  await page.getByTestId('monitor-curves').locator('canvas').first().waitFor();
  await both(page, 'design-view');
  const before = await view.revisionNumbers();

  await page.getByRole('link', { name: /^Edit/ }).click();
  const editor = new DesignEditorPage(page);
  await editor.thickness(2).waitFor();
  await editor.thickness(2).fill('-4');
  await editor.save();
  await editor.fieldErrors().first().waitFor();
  assert(((await editor.fieldErrors().first().textContent()) ?? '').includes('must be a finite number > 0'), 'negative thickness refused at the field');
  await both(page, 'design-editor-error');
  await editor.thickness(2).fill('37.5');
  await page.getByRole('button', { name: 'Duplicate layer 4' }).click();
  await page.getByRole('button', { name: 'Remove layer 5' }).click();
  await editor.save();
  await page.waitForURL(/\/designs\/\d+\?revision=\d+$/);
  const after = await view.revisionNumbers();
  assertEqual(after[0], Math.max(...before) + 1, 'a new revision on top');
  assertEqual(after.length, before.length + 1, 'one revision more');

  await new Shell(page).go('Runs');
  await new RunsList(page).open('B2-0587');
  const link = page.getByTestId('run-design-link');
  assert(((await link.textContent()) ?? '').includes('rev. 1'), 'the old run still names revision 1');
  await link.click();
  await page.waitForURL(/revision=1$/);
  await page.getByText(/^Revision 1 of \d+,/).waitFor();
  await page.goto(page.url().replace(/\?revision=1$/, `/compare?a=1&b=${after[0]}`));
  await page.getByTestId('layer-diff').waitFor();
  assertEqual(await page.locator('[data-diff="changed"]').count(), 1, 'one layer differs between revision 1 and the edit');
  await both(page, 'design-compare');
});

test('an engineer imports and exports a design; a fault names its key', async (page) => {
  await signInEngineer(page);
  await page.goto(`${baseUrl}/designs`);
  const list = new DesignsList(page);
  const name = `Browser import ${Date.now().toString(36)}`;
  const doc = {
    format: 'fringelog.design/1',
    name,
    referenceWavelengthNm: 550,
    substrate: 'crown-glass-1.52',
    materials: { H: 'Ta2O5', L: 'SiO2' },
    layers: [
      { material: 'H', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
      { material: 'L', qwot: 1, monitor: { wavelengthNm: 3000, mode: 'T', chip: 1, cut: 'turning-point' } },
    ],
  };
  await list.importFile('bad.json', JSON.stringify(doc));
  await list.importError().waitFor();
  assert(((await list.importError().textContent()) ?? '').includes('layers[1].monitor.wavelengthNm'), 'the fault names its key');
  await both(page, 'design-import-error');
  doc.layers[1].monitor.wavelengthNm = 550;
  await list.importFile('good.json', JSON.stringify(doc));
  await page.waitForURL(/\/designs\/\d+\?revision=1$/);
  await page.getByRole('heading', { name }).waitFor();
  const href = await new DesignView(page).exportHref();
  assert(href, 'export link');
  const res = await page.request.get(`${baseUrl}${href}`);
  assertEqual(res.status(), 200, 'export status');
  const exported = (await res.json()) as { name: string; layers: unknown[] };
  assertEqual([exported.name, exported.layers.length], [name, 2], 'exported name and layers');
});

test('a design whose material table covers part of the range draws its spectrum where it can, and says so', async (page) => {
  await signInEngineer(page);
  await page.goto(`${baseUrl}/designs`);
  const name = `Browser narrow table ${Date.now().toString(36)}`;
  const doc = {
    format: 'fringelog.design/1', name, referenceWavelengthNm: 550, substrate: 'crown-glass-1.52',
    materials: { H: 'Ta2O5', L: { model: 'table', points: [[500, 1.462, 0], [600, 1.458, 0], [700, 1.455, 0]] } },
    layers: [
      { material: 'H', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
      { material: 'L', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
    ],
  };
  await new DesignsList(page).importFile('narrow.json', JSON.stringify(doc));
  await page.waitForURL(/\/designs\/\d+\?revision=1$/);
  const note = page.getByTestId('spectrum-note');
  await note.waitFor();
  const text = (await note.textContent()) ?? '';
  // (the page's default range runs from 0.7·λref, 390 nm here, on a grid of 600 steps)
  assert(/^Shown over 500(\.\d)?–699\.\d nm only: material "L": wavelength 390 nm is outside the material's valid range 500–700 nm\.$/.test(text), `spectrum note: ${text}`);
  await page.getByTestId('spectrum').locator('canvas').first().waitFor();
  assertEqual(await page.getByTestId('spectrum').getByRole('alert').count(), 0, 'no error in place of the plot');
  // the single-layer rule's band (0.8–1.25 λref, 440–688 nm) narrowed the same way, not a failed page
  const rule = (await page.getByTestId('single-layer-rule').textContent()) ?? '';
  assert(rule.includes('Mean R, 500–688 nm') && rule.includes('narrowed to where every material of the design has an index'), `single-layer rule: ${rule}`);
  await both(page, 'design-spectrum-narrow-table');
});

test('an operator reads designs and materials but is refused editing', async (page) => {
  await signInAs(page, 'operator');
  await page.goto(`${baseUrl}/designs`);
  assertEqual(await page.getByTestId('import-design').count(), 0, 'no import form for an operator');
  await new DesignsList(page).open('LK-AR1');
  await page.getByTestId('cut-plan').waitFor();
  assertEqual(await page.getByRole('link', { name: /^Edit/ }).count(), 0, 'no edit link for an operator');
  const res = await page.goto(`${page.url().split('?')[0]}/edit`);
  assertEqual(res?.status(), 403, 'edit page status for an operator');
  await both(page, 'design-edit-forbidden');
  await page.goto(`${baseUrl}/materials`);
  await page.getByTestId('builtin-materials').waitFor();
  assertEqual(await page.getByRole('link', { name: 'New material' }).count(), 0, 'no new-material link for an operator');
  await both(page, 'materials-list');
  await page.goto(`${baseUrl}/materials/SiO2`);
  await page.getByTestId('fitted-index').waitFor();
  assertEqual(await page.getByRole('button', { name: /^Adopt/ }).count(), 0, 'an operator cannot adopt');
  await both(page, 'material-sio2');
});

test('an engineer creates a material; a bad model is refused at its field', async (page) => {
  await signInEngineer(page);
  await page.goto(`${baseUrl}/materials/new`);
  const name = `LK-Al2O3-${Date.now().toString(36)}`;
  await page.getByLabel('Name').fill(name);
  await page.getByLabel('Dispersion model').selectOption('cauchy');
  await page.getByLabel('A', { exact: true }).fill('1.62');
  await page.getByLabel('B (µm²)').fill('x');
  await page.getByRole('button', { name: 'Create material' }).click();
  await page.locator('[data-field-error="model.B"]').waitFor();
  await both(page, 'material-new-error');
  await page.getByLabel('B (µm²)').fill('0.006');
  await page.getByLabel('Valid from (nm)').fill('350');
  await page.getByLabel('Valid to (nm)').fill('1200');
  await page.getByRole('button', { name: 'Create material' }).click();
  await page.waitForURL(new RegExp(`/materials/${name}$`));
  await page.getByTestId('material-model').waitFor();
  assert(((await page.getByTestId('material-model').textContent()) ?? '').includes('Cauchy A 1.62'), 'the model is stored');
  await page.getByTestId('fitted-none').waitFor();
  await both(page, 'material-view');
});
