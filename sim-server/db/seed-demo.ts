import { readdir, readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { eq, sql } from 'drizzle-orm';
import { scenarios, teams, users } from '../../drizzle/schema';
import type { Role } from '../../shared/protocol/api-types';
import { parseScenarioText } from '../../shared/scenario/parse-scenario';
import { describeFieldErrors } from '../../shared/validation/field-errors';
import { hashPassword, verifyPassword } from '../auth/passwords';
import type { Database } from './database';

export const DEMO_TEAM_NAME = 'Demo axis lab';

/** The demo sign-ins; shown on the sign-in page in demo mode only. Invented people. */
export const DEMO_ACCOUNTS: { email: string; password: string; role: Role; displayName: string }[] = [
  { email: 'rhea.engineer@demo.kinetwin.test', password: 'bench-demo-rhea', role: 'engineer', displayName: 'Rhea Okafor (demo engineer)' },
  { email: 'tomas.lead@demo.kinetwin.test', password: 'bench-demo-tomas', role: 'lead', displayName: 'Tomás Varga (demo lead)' },
];

const scenariosFolder = fileURLToPath(new URL('../../scenarios', import.meta.url));

/**
 * Seeds the demo team, users and the scenarios in scenarios/. Idempotent: users are matched by
 * e-mail and scenarios by file name, so a second run changes nothing unless the files changed.
 */
export async function seedDemo(db: Database): Promise<{ users: number; scenarios: number }> {
  const files = (await readdir(scenariosFolder)).filter((f) => f.endsWith('.json')).sort();
  const documents = await Promise.all(
    files.map(async (file) => {
      const parsed = parseScenarioText(await readFile(`${scenariosFolder}/${file}`, 'utf8'));
      if (!parsed.ok) throw new Error(`demo scenario scenarios/${file} is invalid: ${describeFieldErrors(parsed.errors)}`);
      return { key: file.replace(/\.json$/, ''), scenario: parsed.value };
    }),
  );

  return db.transaction(async (tx) => {
    // One seed at a time, even if two servers start together against the same database.
    await tx.execute(sql`SELECT pg_advisory_xact_lock(7314001)`);
    let [team] = await tx.select().from(teams).where(eq(teams.name, DEMO_TEAM_NAME));
    team ??= (await tx.insert(teams).values({ name: DEMO_TEAM_NAME }).returning())[0]!;

    const ids: number[] = [];
    for (const account of DEMO_ACCOUNTS) {
      const [existing] = await tx.select().from(users).where(eq(users.email, account.email));
      if (existing) {
        if (!(await verifyPassword(account.password, existing.passwordHash)) || existing.role !== account.role) {
          await tx
            .update(users)
            .set({ passwordHash: await hashPassword(account.password), role: account.role, displayName: account.displayName })
            .where(eq(users.id, existing.id));
        }
        ids.push(existing.id);
      } else {
        const [created] = await tx
          .insert(users)
          .values({ teamId: team.id, email: account.email, displayName: account.displayName, role: account.role, passwordHash: await hashPassword(account.password) })
          .returning({ id: users.id });
        ids.push(created!.id);
      }
    }

    const ownerId = ids[0]!;
    for (const { key, scenario } of documents) {
      await tx
        .insert(scenarios)
        .values({ teamId: team.id, ownerId, name: scenario.name, document: scenario, demoKey: key })
        .onConflictDoUpdate({
          target: scenarios.demoKey,
          set: { name: scenario.name, document: scenario, updatedAt: sql`now()` },
          // Leave the row (and its updated time) alone when the file has not changed.
          setWhere: sql`${scenarios.document} IS DISTINCT FROM excluded.document`,
        });
    }
    return { users: ids.length, scenarios: documents.length };
  });
}
