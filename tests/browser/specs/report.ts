import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { assert, assertEqual, shot, signInAs, test } from '../harness';
import { RunsList, Shell } from '../pages';

const pdfPath = path.resolve(import.meta.dirname, '..', '..', 'screenshots', 'run-report.pdf');

/** pdftoppm (poppler) when the machine has it, else null: the pages are then looked at as the browser prints them. */
function pdftoppm(): string | null {
  try {
    return execFileSync('which', ['pdftoppm'], { encoding: 'utf8' }).trim() || null;
  } catch {
    return null;
  }
}

test('a supervisor prints a run report to PDF: facts, disposition, results, plots and lines to sign', async (page) => {
  await signInAs(page, 'supervisor');
  await new Shell(page).go('Runs');
  const list = new RunsList(page);
  await list.table().waitFor();
  await list.open('B3-1121');
  await page.getByRole('heading', { name: 'Run B3-1121' }).waitFor();
  await page.getByTestId('report-link').click();
  const report = page.getByTestId('run-report');
  await report.waitFor();
  await page.getByRole('heading', { name: 'Run B3-1121' }).waitFor();
  for (const fact of ['Design', 'Chamber', 'Shift', 'Operator', 'Date']) await report.locator('dt', { hasText: fact }).waitFor();

  const disposition = (await page.getByTestId('report-disposition').textContent()) ?? '';
  assert(/Not decided|Good to ship|Held for review|Not to ship/.test(disposition), `a disposition or "Not decided": ${disposition}`);
  assert(((await page.getByTestId('advisory').textContent()) ?? '').includes('advisory'), 'the advisory caution is printed');

  const rows = page.getByTestId('report-layers').locator('tbody tr');
  const n = await rows.count();
  assert(n >= 2, `a results row per layer, ${n} found`);
  const first = (await rows.first().textContent()) ?? '';
  assert(/±/.test(first) && /%/.test(first), `thickness and cut error with their σ: ${first}`);
  assert(/within tolerance|near the limit|outside tolerance/.test(first), `the cut grade in words, not colour alone: ${first}`);

  const signatures = page.getByTestId('report-signatures');
  for (const who of ['Operator', 'Process engineer', 'Supervisor']) await signatures.getByRole('cell', { name: who, exact: true }).waitFor();
  await page.getByTestId('report-trace').locator('canvas').first().waitFor();
  await page.getByTestId('report-index').locator('canvas').first().waitFor();

  // No navigation chrome on paper.
  await page.emulateMedia({ media: 'print' });
  assertEqual(await page.getByRole('navigation', { name: 'Main' }).isVisible(), false, 'the app navigation is hidden when printed');
  assertEqual(await page.getByRole('link', { name: '← Back to the run' }).isVisible(), false, 'the way back is left off paper');
  await page.setViewportSize({ width: 794, height: 1123 });
  await shot(page, 'run-report-print');
  await page.emulateMedia({ media: 'screen' });
  await page.setViewportSize({ width: 390, height: 844 });
  // The charts redraw at the narrower width a frame or two after the resize.
  await page.waitForFunction(() => document.documentElement.scrollWidth <= document.documentElement.clientWidth, null, { timeout: 3000 }).catch(() => {});
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  assertEqual(overflow, 0, 'on a phone the results table scrolls inside its box, the page does not');
  await shot(page, 'run-report-phone');
  await page.setViewportSize({ width: 1280, height: 800 });
  await shot(page, 'run-report-desktop');

  await page.pdf({ path: pdfPath, format: 'A4', preferCSSPageSize: true, printBackground: true });
  const pdf = fs.readFileSync(pdfPath, 'latin1');
  assert(pdf.startsWith('%PDF-'), 'a PDF file');
  const pages = (pdf.match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
  // Three sections, each from a new page: results, plots, notes with the lines to sign.
  assert(pages >= 3, `a page for each section: the PDF has ${pages} page(s)`);
  const sizes = [...pdf.matchAll(/\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/g)].map((m) => [Number(m[1]), Number(m[2])]);
  // A4 is 210 × 297 mm, 595.3 × 841.9 pt at 72 pt/in (ISO 216).
  assert(sizes.length === pages && sizes.every(([w, h]) => Math.abs(w - 595.3) < 2 && Math.abs(h - 841.9) < 2), `A4 portrait pages: ${JSON.stringify(sizes)}`);
  const images = (pdf.match(/\/Subtype\s*\/Image/g) ?? []).length;
  assert(images >= 3, `the trace, its residual and the index plot printed as images: ${images} found`);
  const tool = pdftoppm();
  if (tool) execFileSync(tool, ['-png', '-r', '60', pdfPath, pdfPath.replace(/\.pdf$/, '')]);
  console.log(`    run-report.pdf: ${pages} page(s)${tool ? ', pages as PNG by pdftoppm' : '; pdftoppm absent, print-media screenshot only'}`);
});
