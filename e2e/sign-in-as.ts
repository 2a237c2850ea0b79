import type { Page } from 'playwright-core';

/** One of the seeded demo sign-ins (sim-server/db/seed-demo.ts). */
export interface DemoSignIn {
  email: string;
  password: string;
}

/** Signs in through the sign-in page and waits for the library, where every sign-in lands. */
export async function signInAs(page: Page, baseUrl: string, account: DemoSignIn): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.fill('input[name=email]', account.email);
  await page.fill('input[name=password]', account.password);
  await page.click('[data-test=sign-in]');
  await page.waitForURL('**/library');
}

/** Console errors and uncaught exceptions the page reported. */
export function consoleProblems(page: Page): string[] {
  const problems: string[] = [];
  page.on('console', (msg) => {
    if (msg.type() === 'error') problems.push(msg.text());
  });
  page.on('pageerror', (err) => problems.push(err.message));
  return problems;
}
