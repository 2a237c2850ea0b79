import { execFile } from 'node:child_process';
import { chmodSync, chownSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir, userInfo } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';

const run = promisify(execFile);

/** The database every throwaway cluster holds, with the roles of scripts/sql/local-roles.sql. */
export const THROWAWAY_DATABASE = 'kinetwin_faults';
const SUPERUSER = 'kinetwin';
/** The same roles scripts/local-postgres.sh makes, from the same file. */
const ROLES_SQL = readFileSync(new URL('../../scripts/sql/local-roles.sql', import.meta.url), 'utf8');

/**
 * A PostgreSQL cluster of a test's own, in a temp folder on a free loopback port, so the test can
 * really stop and start the database under a running server without touching anyone else's.
 */
export interface ThrowawayCluster {
  port: number;
  /** Connection URL of THROWAWAY_DATABASE as the app role (DATABASE_URL). */
  url: string;
  /** The same as the owner role (DATABASE_OWNER_URL). */
  ownerUrl: string;
  /** The same as the cluster's superuser. */
  superuserUrl: string;
  /** pg_ctl start, waiting until it accepts connections. */
  start(): Promise<void>;
  /** pg_ctl stop; 'immediate' ends every backend at once with no checkpoint, as a crash would. */
  stop(mode: 'fast' | 'immediate'): Promise<void>;
  /** Stops the cluster if it runs and deletes its folder. */
  destroy(): Promise<void>;
}

/** Debian's newest server binaries (/usr/lib/postgresql/N/bin), as scripts/local-postgres.sh finds them. */
function binDir(): string {
  const versions = readdirSync('/usr/lib/postgresql').sort((a, b) => Number(b) - Number(a));
  if (versions.length === 0) throw new Error('no PostgreSQL server binaries under /usr/lib/postgresql (apt-get install postgresql)');
  return `/usr/lib/postgresql/${versions[0]}/bin`;
}

/** initdb and postgres refuse to run as root: then the cluster belongs to the postgres user. */
const asRoot = userInfo().uid === 0;
function asOwner(command: string, args: string[]) {
  return asRoot ? run('runuser', ['-u', 'postgres', '--', command, ...args]) : run(command, args);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

/** initdb in a new temp folder, start, and create THROWAWAY_DATABASE (about 2–3 s cold). */
export async function createThrowawayCluster(): Promise<ThrowawayCluster> {
  const bin = binDir();
  const folder = mkdtempSync(path.join(tmpdir(), 'kinetwin-pg-'));
  const dataDir = path.join(folder, 'data');
  mkdirSync(dataDir, { mode: 0o700 });
  if (asRoot) {
    // The postgres user must reach the data folder and own it (initdb refuses a folder it does not own).
    chmodSync(folder, 0o755);
    const { stdout } = await run('id', ['-u', 'postgres']);
    const { stdout: gid } = await run('id', ['-g', 'postgres']);
    chownSync(dataDir, Number(stdout.trim()), Number(gid.trim()));
  }
  await asOwner(`${bin}/initdb`, ['-D', dataDir, '-U', SUPERUSER, '--auth=trust', '--encoding=UTF8', '--locale=C.UTF-8', '--no-sync']);
  const port = await freePort();
  const pgCtl = (...args: string[]) => asOwner(`${bin}/pg_ctl`, ['-D', dataDir, ...args]);
  let running = false;
  const cluster: ThrowawayCluster = {
    port,
    url: `postgres://kinetwin_app@127.0.0.1:${port}/${THROWAWAY_DATABASE}`,
    ownerUrl: `postgres://kinetwin_owner@127.0.0.1:${port}/${THROWAWAY_DATABASE}`,
    superuserUrl: `postgres://${SUPERUSER}@127.0.0.1:${port}/${THROWAWAY_DATABASE}`,
    start: async () => {
      await pgCtl('-l', path.join(dataDir, 'server.log'), '-w', '-t', '60', '-o', `-c listen_addresses=127.0.0.1 -p ${port} -k ${dataDir}`, 'start');
      running = true;
    },
    stop: async (mode) => {
      await pgCtl('-m', mode, '-w', 'stop');
      running = false;
    },
    destroy: async () => {
      if (running) await cluster.stop('immediate').catch(() => {});
      rmSync(folder, { recursive: true, force: true });
    },
  };
  try {
    await cluster.start();
    const admin = new pg.Client({ connectionString: `postgres://${SUPERUSER}@127.0.0.1:${port}/postgres` });
    await admin.connect();
    await admin.query(`CREATE DATABASE ${THROWAWAY_DATABASE}`);
    await admin.end();
    const inDatabase = new pg.Client({ connectionString: cluster.superuserUrl });
    await inDatabase.connect();
    await inDatabase.query(ROLES_SQL);
    await inDatabase.end();
  } catch (err) {
    await cluster.destroy();
    throw err;
  }
  return cluster;
}
