import { baseUrl, assertEqual, shot, test } from '../harness';

test('an unknown address shows the not-found page', async (page) => {
  const res = await page.goto(`${baseUrl}/no-such-page`);
  assertEqual(res?.status(), 404, 'status');
  await page.getByText('Nothing here').waitFor();
  await shot(page, 'not-found');
});

