import type { Database } from '../db/database';
import type { Mailer } from '../mail/mailer';

/** What the library's route groups need: the database, the mailer and where links point. */
export interface LibraryDeps {
  db: Database;
  mailer: Mailer;
  /** Origin of the app, e.g. http://127.0.0.1:4300; e-mailed links start with it. */
  /** Origin e-mailed links start with (APP_BASE_URL, or where this server really listens). */
  appBaseUrl: () => string;
}

/** Link to a scenario in the app, for e-mails. */
export function scenarioLink(appBaseUrl: string, scenarioId: number, revision?: number): string {
  return `${appBaseUrl}/library/${scenarioId}${revision === undefined ? '' : `?revision=${revision}`}`;
}
