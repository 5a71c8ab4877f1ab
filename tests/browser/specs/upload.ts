import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { baseUrl, assert, assertEqual, shot, signInAs, test } from '../harness';
import { Shell, UploadDeskPage } from '../pages';

const samples = path.resolve(import.meta.dirname, '..', '..', '..', 'sample-traces');
const BB4 = 'Larkspur LK-BB4 four-layer broadband visible antireflection';

/** A copy of a sample trace under a name and run code of this test's own (the demo already holds the original). */
function copyOf(sample: string, runCode: string, edit: (lines: string[]) => void = () => undefined): string {
  const lines = fs.readFileSync(path.join(samples, sample), 'utf8').split('\n');
  const at = lines.findIndex((l) => l.startsWith('# run:'));
  lines[at] = `# run: ${runCode}`;
  edit(lines);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringelog-upload-'));
  const file = path.join(dir, `${runCode}.csv`);
  fs.writeFileSync(file, lines.join('\n'));
  return file;
}

test('an operator uploads a trace: fields from its header, progress, the analyses until done, then the run', async (page, context) => {
  await signInAs(page, 'operator');
  await new Shell(page).go('Upload');
  await page.getByRole('heading', { name: 'Upload traces' }).waitFor();
  const runCode = `B2-T${Date.now().toString(36).toUpperCase()}`;
  const file = copyOf('bay2-bb4-run0587.csv', runCode);
  const name = path.basename(file);
  const desk = new UploadDeskPage(page);
  await desk.choose(file);
  // filled from the trace's "# key: value" lines; the design is not named there, so the operator picks it
  assertEqual(await desk.field(name, 'Chamber').inputValue(), 'Bay 2 IAD', 'chamber from the header');
  assertEqual(await desk.field(name, 'Run code').inputValue(), runCode, 'run code from the header');
  assertEqual(await desk.field(name, 'Design').inputValue(), '', 'design left to choose');
  await desk.field(name, 'Design').selectOption(BB4);
  // the design's newest revision (the designs spec, run before, may have saved another)
  const revisions = await desk.field(name, 'Revision').locator('option').evaluateAll((os) => os.map((o) => Number((o as HTMLOptionElement).value)).filter((v) => v > 0));
  assertEqual(await desk.field(name, 'Revision').inputValue(), String(Math.max(...revisions)), 'newest revision chosen');
  await shot(page, 'upload-ready');

  // A slow link, so the progress bar is seen part-way.
  const cdp = await context.newCDPSession(page);
  await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 80 * 1024 });
  await desk.upload(name);
  const bar = desk.progress(name);
  await bar.waitFor();
  let partWay = false;
  for (let i = 0; i < 100 && !partWay; i++) {
    const now = Number(await bar.getAttribute('aria-valuenow'));
    partWay = now > 0 && now < 100;
    if (!partWay) await page.waitForTimeout(20);
  }
  assert(partWay, 'the progress bar showed the upload part-way');
  await shot(page, 'upload-progress');
  await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

  await page.locator(`[data-testid="upload-item"][data-file="${name}"][data-stage="stored"]`).waitFor({ timeout: 30000 });
  await page.waitForFunction((n) => document.querySelectorAll(`[data-file="${n}"] [data-testid="analysis-watch"] li[data-state="done"]`).length === 2, name, { timeout: 90000 });
  assertEqual(await desk.analysisStates(name).count(), 2, 'two analyses watched');
  await shot(page, 'upload-analysed');
  await desk.item(name).getByTestId('open-run').click();
  await page.getByRole('heading', { name: `Run ${runCode}` }).waitFor();
  assertEqual(await page.getByTestId('layer-table').locator('tbody tr').count(), 4, 'layers of the uploaded run');
  await shot(page, 'upload-run');
});

test('a trace whose monitor saw nothing is stored, and its analyses fail naming the layers and the cause', async (page) => {
  await signInAs(page, 'operator');
  await page.goto(`${baseUrl}/runs/upload`);
  const runCode = `B2-F${Date.now().toString(36).toUpperCase()}`;
  // every reading 0.500000: a valid file from a monitor whose light never reached the detector
  const file = copyOf('bay2-bb4-run0587.csv', runCode, (lines) => {
    lines.forEach((l, i) => {
      if (/^\d/.test(l)) lines[i] = l.replace(/^([^,]+),[^,]+/, '$1,0.500000');
    });
  });
  const name = path.basename(file);
  const desk = new UploadDeskPage(page);
  await desk.choose(file);
  await desk.field(name, 'Design').selectOption(BB4);
  await desk.upload(name);
  await page.locator(`[data-testid="upload-item"][data-file="${name}"][data-stage="stored"]`).waitFor({ timeout: 30000 });
  await page.waitForFunction((n) => document.querySelectorAll(`[data-file="${n}"] [data-testid="analysis-watch"] li[data-state="failed"]`).length === 2, name, { timeout: 90000 });
  await desk.item(name).getByTestId('open-run').click();
  await page.getByRole('heading', { name: `Run ${runCode}` }).waitFor();
  const error = (await page.getByTestId('analysis-error').textContent()) ?? '';
  assert(error.startsWith("the monitor did not see 4 of the design's 4 layers grow: layers 1, 2, 3, 4 (H, L, H, L): their readings did not change at all while they grew"), `analysis error: ${error}`);
  assert(error.includes('no light on the detector, or nothing was deposited'), 'the cause is named');
  assertEqual(await page.getByTestId('layer-table').count(), 0, 'no layer table from a failed analysis');
  await shot(page, 'upload-monitor-saw-nothing');
});

test('a malformed trace is refused with its line, and the phone layout holds', async (page) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signInAs(page, 'operator');
  await page.goto(`${baseUrl}/runs/upload`);
  let badLine = 0;
  const file = copyOf('bay1-ar1-run0412.csv', `B1-BAD${Date.now().toString(36).toUpperCase()}`, (lines) => {
    const i = lines.findIndex((l) => /^\d/.test(l)) + 10;
    lines[i] = lines[i].replace(/^([^,]*),([^,]*)/, '$1,n/a');
    badLine = i + 1;
  });
  const name = path.basename(file);
  const desk = new UploadDeskPage(page);
  await desk.choose(file);
  await desk.field(name, 'Design').selectOption('Larkspur LK-AR1 single-layer MgF2 antireflection on crown glass');
  await desk.upload(name);
  const error = desk.error(name);
  await error.waitFor();
  const text = (await error.textContent()) ?? '';
  assert(text.includes(`line ${badLine}`) && text.includes('signal'), `the refusal names line ${badLine} and the column: ${text}`);
  await shot(page, 'upload-refused-phone');
  const width = await page.evaluate(() => document.documentElement.scrollWidth);
  assert(width <= 390, `no sideways scrolling on a phone (page is ${width} px wide)`);
});

test('an admin creates a chamber token, sees it once, and revokes it after confirming', async (page) => {
  await signInAs(page, 'admin');
  await new Shell(page).go('Chamber tokens');
  await page.getByRole('heading', { name: 'Chamber tokens' }).waitFor();
  await page.getByLabel('Chamber', { exact: true }).selectOption({ label: 'Bay 3 sputter' });
  await page.getByLabel('Used by').fill('Bay 3 controller PC (browser test)');
  await page.getByRole('button', { name: 'Create token' }).click();
  const value = (await page.getByTestId('token-value').textContent())?.trim() ?? '';
  assert(/^flk_[A-Za-z0-9_-]{43}$/.test(value), `a token is shown once: ${value}`);
  await shot(page, 'chamber-token-created');
  const res = await page.request.get(`${baseUrl}/api/runs?pageSize=5`, { headers: { authorization: `Bearer ${value}` } });
  assertEqual(res.status(), 200, 'the token reads its chamber');
  await page.reload();
  assertEqual(await page.getByTestId('token-value').count(), 0, 'not shown again');
  const row = page.locator(`tr[data-token-hint="flk_…${value.slice(-4)}"]`);
  assert(((await row.getByTestId('token-last-used').textContent()) ?? '').includes('UTC'), 'last use shown');
  await row.getByRole('button', { name: 'Revoke…' }).click();
  await row.getByRole('button', { name: 'Revoke token' }).click();
  await row.getByText(/^revoked/).waitFor();
  const after = await page.request.get(`${baseUrl}/api/runs?pageSize=5`, { headers: { authorization: `Bearer ${value}` } });
  assertEqual(after.status(), 401, 'a revoked token is refused');
  await shot(page, 'chamber-token-revoked');
});

// As the admin: the password-reset test of specs/auth.ts changes the engineer's password.
test('an admin (as an engineer may) queues a re-analysis with other settings; it joins the list of analyses when done', async (page) => {
  await signInAs(page, 'admin');
  await page.goto(`${baseUrl}/runs`);
  await page.locator('tr[data-run-code="B2-0587"]').getByRole('link', { name: 'B2-0587' }).click();
  await page.getByRole('heading', { name: 'Run B2-0587' }).waitFor();
  const history = page.getByTestId('analysis-history').locator('li');
  const before = await history.count();
  const form = page.getByTestId('reanalyse-form');
  await form.getByLabel('Mode', { exact: true }).selectOption('sequential');
  await form.getByLabel('Index of thin layers').selectOption('nominal');
  await form.getByLabel('The rate starts up as the shutter opens', { exact: false }).uncheck();
  // a run cut only on level: its own start-up search (with the lamp drift) runs end to end
  await form.getByLabel('On a run cut only on level', { exact: false }).selectOption('on');
  // and each level cut fitted alone (the next-layer window is the default in this mode)
  await form.getByLabel('fit each level-cut layer again with the next two', { exact: false }).uncheck();
  await form.getByLabel('a layer cut on level keeps its chip', { exact: false }).uncheck();
  await form.getByLabel('how far past a turning point the controller may cut', { exact: false }).fill('0.5');
  await form.getByLabel('A periodic disturbance through the run', { exact: false }).selectOption('name');
  await form.getByLabel("as the run's other turning-point cuts show it", { exact: false }).selectOption('uniform');
  // the detector's linearity takes both figures or neither: one alone is refused before anything is queued
  await form.getByLabel('it reads this many % low', { exact: false }).fill('0.5');
  await form.getByRole('button', { name: 'Queue the analysis' }).click();
  await page.getByRole('status').filter({ hasText: 'Detector linearity: give both' }).waitFor();
  assertEqual(await history.count(), before, 'nothing queued on half a linearity');
  await form.getByLabel('at this reading, in the trace', { exact: false }).fill('1.94');
  await form.getByRole('button', { name: 'Queue the analysis' }).click();
  await page.waitForFunction((n) => document.querySelectorAll('[data-testid="analysis-history"] li').length === n + 1, before, { timeout: 15000 });
  await page.getByRole('status').filter({ hasText: /finished/ }).waitFor({ timeout: 90000 });
  const newest = history.first();
  const listed = (await newest.textContent()) ?? '';
  assert(listed.includes('thin layers held at the nominal index') && listed.includes('no start-up at the shutter') && listed.includes('start-up on level cuts') && listed.includes('own gain on level-cut layers') && listed.includes('turning-point overshoot up to 0.5 %') && listed.includes('each level cut fitted alone') && listed.includes('a lamp ripple found through the run named, not divided out') && listed.includes('detector linearised: 0.5 % low at a reading of 1.94') && listed.includes("last cuts' overshoot uniform, not from the run"), `the new analysis lists its settings: ${listed}`);
  // the status line and the list change together: the newest entry is no longer waiting
  // (textContent runs the badge into its neighbours: "#136analysedlayer by layer…")
  assert(listed.includes('analysed') && !listed.includes('waiting') && !listed.includes('analysing'), `the list caught up with the status line: ${listed}`);
  await shot(page, 'run-reanalysed');
  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto(`${baseUrl}/runs?chamber=Bay%202%20IAD`);
  await page.getByTestId('runs-table').waitFor();
  await shot(page, 'runs-list-phone');
});
