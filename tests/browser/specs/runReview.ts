import { baseUrl, assert, assertEqual, shot, signInAs, test } from '../harness';
import { RunView, RunsList, Shell } from '../pages';

async function openRun(page: Parameters<Parameters<typeof test>[1]>[0], code: string): Promise<RunView> {
  await new Shell(page).go('Runs');
  const list = new RunsList(page);
  await list.table().waitFor();
  await list.open(code);
  await page.getByRole('heading', { name: `Run ${code}` }).waitFor();
  const run = new RunView(page);
  await run.plot().locator('canvas').first().waitFor();
  return run;
}

test('an operator zooms to a layer from the table and pins a note on the trace', async (page) => {
  await signInAs(page, 'operator');
  const run = await openRun(page, 'B3-1121');
  await page.waitForFunction(() => document.querySelector('[data-testid="trace-plot"]')?.hasAttribute('data-view-to'));
  const whole = await run.view();
  await run.showLayer(3);
  await page.waitForFunction((w) => Number(document.querySelector('[data-testid="trace-plot"]')?.getAttribute('data-view-to')) < w, whole[1]);
  const view = await run.view();
  assert(view[1] - view[0] < (whole[1] - whole[0]) / 3, `zoomed to layer 3: ${view.join('–')} s of ${whole.join('–')} s`);
  const row = page.getByTestId('layer-table').locator('tr[data-layer="3"]');
  assertEqual(await row.getAttribute('aria-selected'), 'true', 'layer 3 row selected');
  await run.pinNoteAtPlotCentre('Rate wobble just before the cut: check the crucible sweep');
  const list = page.getByTestId('annotation-list');
  await list.getByText('Rate wobble just before the cut').waitFor();
  const pinned = (await list.locator('li').last().textContent()) ?? '';
  assert(pinned.includes('layer 3'), `note pinned to layer 3: ${pinned}`);
  const t = Number(/(\d+\.\d) s/.exec(pinned)?.[1]);
  assert(t >= view[0] && t <= view[1], `note pinned at ${t} s, inside the view ${view.join('–')} s`);
  // keyboard: zoom out fully from the plot itself
  await run.plot().focus();
  await page.keyboard.press('0');
  await page.waitForFunction((w) => Number(document.querySelector('[data-testid="trace-plot"]')?.getAttribute('data-view-to')) >= w - 0.01, whole[1]);
  await shot(page, 'run-review-operator-desktop');
  await page.setViewportSize({ width: 390, height: 844 });
  await page.getByTestId('layer-cards').waitFor();
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  assertEqual(overflow, 0, 'nothing wider than the phone screen');
  await shot(page, 'run-review-operator-phone');
  await page.setViewportSize({ width: 1280, height: 800 });
});

test('a supervisor sets a disposition with a reason', async (page) => {
  await signInAs(page, 'supervisor');
  const run = await openRun(page, 'B3-1121');
  await run.decide('Held for review', 'Layer 9 cut late; waiting for the spectrophotometer check');
  await page.getByTestId('disposition-state').getByText('Held for review').waitFor();
  assert((await run.disposition().textContent())?.includes('waiting for the spectrophotometer check'), 'reason shown');
  await shot(page, 'run-review-supervisor-disposition');
  await page.setViewportSize({ width: 390, height: 844 });
  await shot(page, 'run-review-supervisor-phone');
  await page.setViewportSize({ width: 1280, height: 800 });
});

test('an operator is refused the disposition', async (page) => {
  await signInAs(page, 'operator');
  const run = await openRun(page, 'B3-1121');
  await run.disposition().getByText('Process engineers and supervisors decide').waitFor();
  assertEqual(await page.getByRole('button', { name: /Decide the disposition|Change the disposition/ }).count(), 0, 'no disposition button for an operator');
  const res = await page.goto(`${baseUrl}/runs/${page.url().split('/runs/')[1]?.split('?')[0]}`);
  assertEqual(res?.status(), 200, 'the run still reads');
});
