import { readdir, readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { and, desc, eq, sql } from 'drizzle-orm';
import { scenarioRevisions, scenarios, teams, users } from '../../drizzle/schema';
import type { Role } from '../../shared/protocol/api-types';
import { parseScenarioText } from '../../shared/scenario/parse-scenario';
import { describeFieldErrors } from '../../shared/validation/field-errors';
import { hashPassword, verifyPassword } from '../auth/passwords';
import { appendRevision, insertScenario, lockScenario } from '../scenarios/revision-store';
import type { Database } from './database';

export const DEMO_TEAM_NAME = 'Demo axis lab';

/** The demo sign-ins; shown on the sign-in page in demo mode only. Invented people. The role is not part of the name: pages show it beside the name, once. */
export const DEMO_ACCOUNTS: { email: string; password: string; role: Role; displayName: string }[] = [
  { email: 'rhea.engineer@demo.kinetwin.test', password: 'bench-demo-rhea', role: 'engineer', displayName: 'Rhea Okafor' },
  { email: 'tomas.lead@demo.kinetwin.test', password: 'bench-demo-tomas', role: 'lead', displayName: 'Tomás Varga' },
  { email: 'ines.admin@demo.kinetwin.test', password: 'bench-demo-ines', role: 'admin', displayName: 'Inès Moreau' },
  { email: 'kofi.viewer@demo.kinetwin.test', password: 'bench-demo-kofi', role: 'viewer', displayName: 'Kofi Mensah' },
];

/** Note of the revisions the seed writes; a demo file is re-seeded only when it differs from the last one. */
export const DEMO_SEED_NOTE = 'Demo scenario file';

const scenariosFolder = fileURLToPath(new URL('../../scenarios', import.meta.url));

/**
 * Seeds the demo team, users and the scenarios in scenarios/. Idempotent: users are matched by
 * e-mail and scenarios by file name, so a second run changes nothing unless the files changed;
 * a changed file becomes a new revision on top of whatever the team saved since.
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
      const [existing] = await tx.select({ id: scenarios.id }).from(scenarios).where(eq(scenarios.demoKey, key));
      if (!existing) {
        await insertScenario(tx, team.id, ownerId, scenario, DEMO_SEED_NOTE, ['demo'], key);
        continue;
      }
      const locked = await lockScenario(tx, team.id, existing.id);
      if (!locked) continue; // a demo key moved to another team by hand: leave it alone
      // Compared in the database: jsonb does not keep key order, so text comparison would not do.
      const [last] = await tx
        .select({ same: sql<boolean>`${scenarioRevisions.document} = ${JSON.stringify(scenario)}::jsonb` })
        .from(scenarioRevisions)
        .where(and(eq(scenarioRevisions.scenarioId, existing.id), eq(scenarioRevisions.note, DEMO_SEED_NOTE)))
        .orderBy(desc(scenarioRevisions.number))
        .limit(1);
      const [headSame] = last
        ? [last]
        : await tx
            .select({ same: sql<boolean>`${scenarioRevisions.document} = ${JSON.stringify(scenario)}::jsonb` })
            .from(scenarioRevisions)
            .where(and(eq(scenarioRevisions.scenarioId, existing.id), eq(scenarioRevisions.number, locked.headRevision)));
      if (!headSame?.same) await appendRevision(tx, existing.id, locked.headRevision, scenario, DEMO_SEED_NOTE, ownerId);
    }
    return { users: ids.length, scenarios: documents.length };
  });
}
