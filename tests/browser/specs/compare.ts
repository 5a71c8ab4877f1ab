import { baseUrl, assert, assertEqual, shot, SHOT_TIMEOUT_MS, signInAs, test } from '../harness';
import { ComparePage, Shell } from '../pages';

/** The figure shown first in a group-table cell: the signed mean. */
const meanOf = (cell: string) => Number(cell.trim().split(/\s/)[0].replace('−', '-').replace('+', ''));

test('compare: the night shift cuts layer 3 of the broadband AR late, and the chart shows Bay 3 drifting', async (page) => {
  await signInAs(page, 'supervisor');
  await new Shell(page).go('Compare');
  await page.getByRole('heading', { name: 'Compare runs' }).waitFor();
  const compare = new ComparePage(page);
  // Default: the design with most runs, cut error; the layer with most results out of tolerance.
  const headers = await compare.groupHeaders('shift');
  assertEqual(headers, ['Layer', 'day', 'early', 'night', 'Difference'], 'shift columns');
  const row = compare.groupRow('shift', 3);
  const cells = (await row.locator('td').allTextContents()).map((s) => s.trim());
  const [day, early, night] = [meanOf(cells[1]), meanOf(cells[2]), meanOf(cells[3])];
  assert(night > day + 1.5 && night > early + 1.5, `night shift's layer 3 cut error (${night}) stands out from day (${day}) and early (${early})`);
  const verdict = (await row.getByTestId('difference').textContent()) ?? '';
  assert(verdict.includes('larger than chance'), `layer 3 by shift: ${verdict}`);
  const layer1 = (await compare.groupRow('shift', 1).getByTestId('difference').textContent()) ?? '';
  assert(layer1.includes('within chance'), `layer 1 by shift is not singled out: ${layer1}`);
  await shot(page, 'compare-desktop');

  // The selection lives in the URL: the index deviation of layer 3, and the chart flags Bay 3's drift.
  await compare.choose('Figure for groups and chart', 'Index deviation (from nominal)');
  await compare.show();
  await page.waitForURL(/metric=index/);
  assert(page.url().includes('layer=3'), `layer carried in the URL: ${page.url()}`);
  const signals = (await compare.ruleSignals().textContent()) ?? '';
  assert(/Rule 1/.test(signals) && signals.includes('Bay 3 sputter'), `rules fired on Bay 3: ${signals.slice(0, 200)}`);
  await shot(page, 'compare-index-chart');

  // Shared link: the same URL opened afresh gives the same selection; the CSV carries it too.
  const shared = page.url();
  await page.goto(shared);
  assertEqual(await page.getByTestId('compare-filters').getByLabel('Figure for groups and chart').inputValue(), 'index', 'metric from the URL');
  const csv = await page.request.get(`${baseUrl}/api/compare/csv?${new URL(shared).searchParams.toString()}&table=shift`);
  assertEqual(csv.status(), 200, 'CSV status');
  const text = await csv.text();
  assert(text.startsWith('layer,shift,figure,n,mean,sd,out_of_tolerance,test'), `CSV header: ${text.slice(0, 80)}`);
  assert(text.includes('Index deviation (from nominal)'), 'CSV names the figure shown');

  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto(`${baseUrl}/compare`);
  await page.getByRole('heading', { name: 'Compare runs' }).waitFor();
  await shot(page, 'compare-phone');
  await page.getByTestId('compare-by-shift').scrollIntoViewIfNeeded();
  await page.screenshot({ path: 'tests/screenshots/compare-phone-shift-table.png', timeout: SHOT_TIMEOUT_MS });
});

test('compare: an operator may look, a bad address says what is wrong', async (page) => {
  await signInAs(page, 'operator');
  await page.goto(`${baseUrl}/compare?from=last-week`);
  const alert = page.getByRole('alert').filter({ hasText: 'The address asked for' });
  await alert.waitFor();
  assert(((await alert.textContent()) ?? '').includes('from: must be a date, YYYY-MM-DD'), 'the bad field is named');
  const csv = await page.request.get(`${baseUrl}/api/compare/csv?table=nope`);
  assertEqual(csv.status(), 400, 'CSV with an unknown table');
});

// The supervisor: the auth specs reset the demo engineer's password.
test('alerts: a supervisor opts in on the account page', async (page) => {
  await signInAs(page, 'supervisor');
  await new Shell(page).go('Account');
  const prefs = page.getByTestId('alert-preferences');
  await prefs.getByLabel(/layer out of tolerance/).check();
  await prefs.getByRole('button', { name: 'Save alert choices' }).click();
  await prefs.getByText('Alert choices saved.').waitFor();
  await page.reload();
  assert(await page.getByTestId('alert-preferences').getByLabel(/layer out of tolerance/).isChecked(), 'the choice is kept');
  assert(!(await page.getByTestId('alert-preferences').getByLabel(/control-chart rule/).isChecked()), 'the other stays off');
  await shot(page, 'account-alerts');
});

test('alerts: an operator is not offered them', async (page) => {
  await signInAs(page, 'operator');
  await new Shell(page).go('Account');
  await page.getByRole('heading', { name: 'Account' }).waitFor();
  assertEqual(await page.getByTestId('alert-preferences').count(), 0, 'alert choices offered to the operator');
});
