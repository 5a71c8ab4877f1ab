import { baseUrl, assert, assertEqual, shot, signInAs, test } from '../harness';
import { RunView, RunsList, Shell } from '../pages';

test('the runs list and a run page: layers of both analyses, the advisory note', async (page) => {
  await signInAs(page, 'operator');
  await new Shell(page).go('Runs');
  await page.getByRole('heading', { name: 'Runs' }).waitFor();
  const list = new RunsList(page);
  await list.table().waitFor();
  // The integration tests, run before on the same database, add runs of their own, and the demo
  // holds the shop's history besides the seven sample runs.
  const sampleCodes = ['B1-0412', 'B1-0413', 'B2-0587', 'B2-0588', 'B3-1120', 'B3-1121', 'B3-1122'];
  const listed = await list.runCodes();
  assertEqual(sampleCodes.filter((c) => listed.includes(c)), sampleCodes, 'sample runs listed');
  // The list is paged: the first page holds some of the ~90 runs of the shop history too.
  assert(listed.filter((c) => /^B\d-\d{4}$/.test(c) && !sampleCodes.includes(c)).length >= 10, 'the shop history is listed');
  await shot(page, 'runs-list');
  await list.open('B3-1121');
  await page.getByRole('heading', { name: 'Run B3-1121' }).waitFor();
  const run = new RunView(page);
  assert((await run.advisory().textContent())?.includes('cut and disposition decisions follow your shop'), 'advisory note shown');
  assertEqual(await run.layerRows().count(), 17, 'layer rows (refit)');
  assertEqual((await run.currentMode().textContent())?.trim(), 'Joint re-fit', 'refit shown first');
  await shot(page, 'run-refit');
  await run.switchTo('Layer by layer');
  await page.waitForURL(/mode=sequential/);
  assertEqual((await run.currentMode().textContent())?.trim(), 'Layer by layer', 'sequential after the switch');
  assertEqual(await run.layerRows().count(), 17, 'layer rows (sequential)');
  await shot(page, 'run-sequential');
  const res = await page.goto(`${baseUrl}/runs/999999`);
  assertEqual(res?.status(), 404, 'status of an unknown run');
  await page.getByText('No such run').waitFor();
  await shot(page, 'run-not-found');
});

