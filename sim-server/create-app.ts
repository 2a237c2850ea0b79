import { existsSync } from 'node:fs';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import path from 'node:path';
import connectPgSimple from 'connect-pg-simple';
import express, { type RequestHandler } from 'express';
import session from 'express-session';
import compression from 'compression';
import helmet from 'helmet';
import type { PassportStatic } from 'passport';
import { pinoHttp } from 'pino-http';
import { Server as SocketServer } from 'socket.io';
import type { AppInfo } from '../shared/protocol/api-types';
import { RUN_NAMESPACE } from '../shared/protocol/run-events';
import { authRoutes } from './auth/auth-routes';
import { handshakeOriginAllowed, requireCsrfToken, requireSameOrigin } from './auth/csrf';
import { closeBcryptWorker } from './auth/legacy-bcrypt';
import { createPassport } from './auth/passport-setup';
import { passwordResetRoutes } from './auth/password-reset-routes';
import { revokeSocketsThrough } from './auth/session-revocation';
import { setPasswordHashConcurrency } from './auth/passwords';
import { RouteTable, type RouteRecord } from './auth/route-table';
import { createSignInLimits } from './auth/sign-in-limits';
import { createCheckPool } from './checks/check-pool';
import { checkRoutes } from './checks/check-routes';
import type { ServerConfig } from './config';
import type { DatabaseHandle } from './db/database';
import { DEMO_ACCOUNTS } from './db/seed-demo';
import { appInfoRoute, healthRoutes } from './health/health-routes';
import { apiNotFound, errorHandler } from './http/error-handler';
import { jsonBody } from './http/json-body';
import { noStore } from './http/no-store';
import { refuseMalformedPath } from './http/path-encoding';
import { refuseUnsafeText } from './http/refuse-unsafe-text';
import type { Logger } from './logging/logger';
import { scenarioActivityRoutes, teamActivityRoutes } from './library/activity-routes';
import { commentRoutes } from './library/comment-routes';
import { handoffListRoutes, scenarioHandoffRoutes } from './library/handoff-routes';
import type { LibraryDeps } from './library/library-deps';
import { logRoutes } from './logs/log-routes';
import { isLogUpload } from './logs/log-upload';
import { mailboxRoutes } from './mail/mailbox-routes';
import { createMailer } from './mail/mailer';
import { createMailTransport } from './mail/mail-transport';
import { registerRunHandlers, type RunNamespace } from './runs/run-handlers';
import { revisionRoutes } from './scenarios/revision-routes';
import { scenarioRoutes } from './scenarios/scenario-routes';
import { teamRoutes } from './team/team-routes';

export interface KinetwinServer {
  http: Server;
  io: SocketServer;
  liveRuns(): number;
  /** Worker threads of the checks pool alive now (0 until the first check). */
  checkThreads(): number;
  /** Every /api route with the access it requires (the role-matrix test walks these). */
  routes: readonly RouteRecord[];
  /** Stops accepting connections, ends live runs, closes sockets and ends the check workers; the database stays open. */
  close(): Promise<void>;
}

/** JSON bodies above this are refused with 413; a scenario file is a few kilobytes. */
export const MAX_JSON_BODY = '256kb';

/**
 * Unsafe requests that need no CSRF token: the ones that start or end a session (sign-in has no
 * session to take a token from yet; the app signs out without one). The Origin check covers them.
 */
export const CSRF_EXEMPT_PATHS = ['/auth/sign-in', '/auth/sign-up', '/auth/sign-out', '/auth/invitations/lookup', '/auth/password-reset/request', '/auth/password-reset/complete'];

/** Builds Express and socket.io on one HTTP server. Listening is the caller's job. */
export function createKinetwinServer(config: ServerConfig, database: DatabaseHandle, logger: Logger, version: string): KinetwinServer {
  const app = express();
  app.disable('x-powered-by');
  // X-Forwarded-For is believed only from the proxies TRUST_PROXY names (none by default): a
  // header any client can write must not choose the address the sign-in limits count against.
  app.set('trust proxy', config.trustProxy);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          // No external host anywhere. Angular Material and Plotly set inline styles at run time.
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          workerSrc: ["'self'", 'blob:'],
          upgradeInsecureRequests: null,
        },
      },
      // Plain-HTTP local use must not be told to upgrade to HTTPS.
      strictTransportSecurity: config.mode === 'production',
    }),
  );
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: (req) => !req.url?.startsWith('/api') },
      // Method, path and status are what an operator reads; headers would carry cookies.
      serializers: { req: (req: { method: string; url: string }) => ({ method: req.method, url: req.url }), res: (res: { statusCode: number }) => ({ status: res.statusCode }) },
    }),
  );

  const PgStore = connectPgSimple(session);
  // Expired sessions are deleted every SESSION_PRUNE_INTERVAL_SECONDS (±50 %, so nodes spread out).
  const sessionStore = new PgStore({ pool: database.pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: config.sessionPruneIntervalSeconds });
  const sessionMiddleware = session({
    store: sessionStore,
    name: 'kinetwin.sid',
    secret: config.sessionSecret,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: { httpOnly: true, sameSite: 'lax', secure: config.mode === 'production' ? 'auto' : false, maxAge: 7 * 24 * 3600_000 },
  });
  const passport = createPassport(database.db) as unknown as PassportStatic;

  const info: AppInfo = {
    version,
    demoMode: config.mode === 'demo',
    demoAccounts: config.mode === 'demo' ? DEMO_ACCOUNTS : [],
  };

  const transport = createMailTransport(config.mailTransport, config.smtpUrl, database.db);
  // Without APP_BASE_URL, links point where this server really listens (PORT=0 picks the port late).
  const linkBase = () => {
    const address = config.appBaseUrlConfigured ? null : http.address();
    return address && typeof address === 'object' ? `http://${config.host}:${address.port}` : config.appBaseUrl;
  };
  const deps: LibraryDeps = { db: database.db, mailer: createMailer(transport, config.mailFrom, logger), appBaseUrl: linkBase };
  const checkPool = createCheckPool({ workers: config.checkWorkers, queueSize: config.checkQueueSize, timeLimitMs: config.checkTimeLimitMs, logger });
  const table = new RouteTable();
  const mount = (path: string, ...groups: ((router: ReturnType<RouteTable['under']>) => void)[]) => {
    const guarded = table.under(`/api${path}`);
    for (const group of groups) group(guarded);
    api.use(path, guarded.router);
  };

  const api = express.Router();
  // Input guards (sim-server/http/): no caching, paths that decode, JSON bodies only, storable text.
  api.use(noStore, refuseMalformedPath(table.routes), ...jsonBody(MAX_JSON_BODY, isLogUpload), refuseUnsafeText);
  api.use('/health', healthRoutes(database.pool, version));
  api.use('/app-info', appInfoRoute(info));
  api.use(sessionMiddleware, passport.initialize(), passport.session());
  api.use(requireSameOrigin(config.appBaseUrl), requireCsrfToken(CSRF_EXEMPT_PATHS));
  setPasswordHashConcurrency(config.passwordHashConcurrency);
  const signInLimits = createSignInLimits(database.pool, {
    accountLimit: config.signInLimit,
    addressLimit: config.signInAddressLimit,
    windowMinutes: config.signInWindowMinutes,
    lockoutMinutes: config.signInLockoutMinutes,
  });
  mount('/auth', (r) =>
    authRoutes(r, { passport, db: database.db, signInLimits, signInWindowMinutes: config.signInWindowMinutes, accountRequestLimit: config.accountRequestLimit, csrfSecret: config.sessionSecret }),
  );
  mount('/auth/password-reset', (r) =>
    passwordResetRoutes(r, { ...deps, ttlMinutes: config.passwordResetTtlMinutes, accountRequestLimit: config.accountRequestLimit, windowMinutes: config.signInWindowMinutes, signInLimits }),
  );
  mount(
    '/scenarios',
    (r) => scenarioRoutes(r, deps),
    (r) => revisionRoutes(r, deps),
    (r) => commentRoutes(r, deps),
    (r) => scenarioHandoffRoutes(r, deps),
    (r) => scenarioActivityRoutes(r, deps),
    (r) => logRoutes(r, { db: database.db, upload: { maxBytes: config.logUploadMaxBytes, dir: config.logUploadDir } }),
  );
  mount('/handoffs', (r) => handoffListRoutes(r, deps));
  mount(
    '/team',
    (r) => teamRoutes(r, { ...deps, invitationTtlHours: config.invitationTtlHours }),
    (r) => teamActivityRoutes(r, deps),
  );
  mount('/dev', (r) => mailboxRoutes(r, database.db));
  mount('/checks', (r) => checkRoutes(r, { pool: checkPool }));
  api.use(apiNotFound);
  app.use('/api', api);

  const staticDir = path.resolve(config.staticDir);
  if (existsSync(path.join(staticDir, 'index.html'))) {
    // The built app is a few MB of JavaScript; gzip takes a cold load to about a quarter of it.
    // Only the app's files: API answers are small, and socket.io frames are its own.
    const compress = compression();
    app.use((req, res, next) => (req.path.startsWith('/socket.io/') ? next() : compress(req, res, next)));
    app.use(express.static(staticDir, { index: false, maxAge: '1h' }));
    // Client-side routes (/library, /bench/3) all load the app shell.
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(staticDir, 'index.html'), { maxAge: 0 }));
  } else {
    logger.warn({ staticDir }, 'no built app found; serving the API only (run `npx ng build`)');
  }
  app.use(errorHandler(logger));

  const http = createServer(app);
  const io = new SocketServer(http, {
    serveClient: false,
    maxHttpBufferSize: 1e6,
    cors: { origin: false },
    allowRequest: (req, callback) => callback(null, handshakeOriginAllowed(req.headers.origin, req.headers.host, config.appBaseUrl)),
  });
  // Sockets share the cookie session; only the handshake needs it, later polling requests do not.
  const handshakeOnly = (middleware: RequestHandler) => (req: IncomingMessage, res: ServerResponse, next: (err?: unknown) => void) => {
    const isHandshake = (req as IncomingMessage & { _query?: Record<string, string> })._query?.sid === undefined;
    if (isHandshake) middleware(req as never, res as never, next);
    else next();
  };
  io.engine.use(handshakeOnly(sessionMiddleware));
  io.engine.use(handshakeOnly(passport.session() as RequestHandler));
  const runs = registerRunHandlers(io.of(RUN_NAMESPACE) as RunNamespace, { db: database.db, logger, maxLiveRuns: config.maxLiveRuns });
  revokeSocketsThrough(app, runs);

  return {
    http,
    io,
    liveRuns: runs.liveRuns,
    checkThreads: checkPool.threads,
    routes: table.routes,
    close: async () => {
      await Promise.all([
        new Promise<void>((resolve) => {
          // io.close() disconnects every socket (ending its runs) and closes the HTTP server.
          io.close(() => resolve());
          http.closeAllConnections();
        }),
        checkPool.close(),
        sessionStore.close(),
        closeBcryptWorker(),
      ]);
    },
  };
}
