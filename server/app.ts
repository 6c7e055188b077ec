import compression from 'compression';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type { Database } from './db/client';
import { ReadCache } from './cache/read-cache';
import { CheckInQueue } from './services/check-in-queue';
import type { Config } from './config';
import { DbSessionStore } from './auth/session-store';
import { createPassport } from './auth/passport';
import { csrfProtection, refuseCrossSite } from './middleware/csrf';
import { apiNotFound, errorHandler } from './middleware/error-handler';
import { idempotency } from './middleware/idempotency';
import { sessionLifetime } from './middleware/session-lifetime';
import { assertEveryRouteRuled } from './route-table';
import { healthRoutes } from './routes/health';
import { authRoutes } from './routes/auth';
import { bikeRoutes } from './routes/bikes';
import { referenceRoutes } from './routes/reference';
import { adminUserRoutes } from './routes/admin-users';
import { dueRoutes } from './routes/due';
import { calendarRoutes } from './routes/calendar';
import { adminMailRoutes } from './routes/admin-mail';
import { adminJobRoutes } from './routes/admin-jobs';
import { taskRoutes } from './routes/tasks';
import { valveRoutes } from './routes/valves';
import { planRoutes } from './routes/plans';
import { settingsRoutes } from './routes/settings';
import { importRoutes } from './routes/imports';
import { recordRoutes } from './routes/records';
import { backupRoutes } from './routes/backup';
import { attachmentRoutes } from './routes/attachments';
import { capacityRoutes } from './routes/capacity';
import { bookingRoutes } from './routes/bookings';
import { workshopPlanRoutes } from './routes/workshop-plan';
import { partRoutes } from './routes/parts';
import type { BlobStore } from './storage/types';
import { createMemoryBlobStore } from './storage/memory';
import type { JobDeps } from '../jobs/types';
import { randomUUID } from 'node:crypto';
import { pinoHttp } from 'pino-http';
import { log, setLogLevel } from './logger';

export interface AppDeps {
  database: Database;
  config: Config;
  sessionSecret: string;
  /** The clock, so tests can move time. */
  now?: () => Date;
  /** A secret the command-line job runner sends to run jobs on this server (kept in the lock file). */
  jobToken?: string;
  /** Uploaded photos and documents (disk under DATA_DIR, or S3-compatible). */
  blobStore?: BlobStore;
  uploadMaxBytes?: number;
  /** Outgoing mail: the SMTP transport (SMTP_URL, or the built-in catcher). */
  mail?: JobDeps['mail'];
  /** Serves the client (production build or Vite in middleware mode), mounted after the API. */
  client?: (app: Express) => void;
}

export interface AppContext {
  database: Database;
  config: Config;
  sessions: DbSessionStore;
  /** Heavy fleet-wide answers, valid while the data version stands. */
  readCache: ReadCache;
  /** Check-ins written in batches while the database is busy. */
  checkIns: CheckInQueue;
  now: () => Date;
  sessionSecret: string;
  publicUrl: (req?: import('express').Request) => string;
  jobDeps: () => JobDeps;
  jobToken?: string;
}

export function createApp(deps: AppDeps): Express {
  const { database, config } = deps;
  setLogLevel(config.LOG_LEVEL);
  const ctx: AppContext = {
    database,
    config,
    sessions: new DbSessionStore(database.db, database.changes),
    readCache: new ReadCache(database.db, { changes: database.changes }),
    checkIns: new CheckInQueue(database.db, deps.now ?? (() => new Date())),
    now: deps.now ?? (() => new Date()),
    sessionSecret: deps.sessionSecret,
    jobToken: deps.jobToken,
    publicUrl: (req) => config.PUBLIC_URL?.replace(/\/$/, '') ?? (req ? `${req.protocol}://${req.get('host')}` : `http://${config.HOST}:${config.PORT}`),
    jobDeps: () => ({
      db: database.db,
      now: ctx.now,
      mail: deps.mail ?? { transport: () => { throw new Error('No mail transport is configured.'); }, from: config.MAIL_FROM },
      publicUrl: ctx.publicUrl(),
      log: (line) => log.info(line),
    }),
  };
  const app = express();
  app.disable('x-powered-by');
  if (config.TRUST_PROXY) app.set('trust proxy', /^\d+$/.test(config.TRUST_PROXY) ? Number(config.TRUST_PROXY) : config.TRUST_PROXY);

  const dev = process.env.NODE_ENV === 'development';
  app.use(
    helmet({
      // Vite's dev preamble is an inline script: the policy is on everywhere but in development.
      contentSecurityPolicy: dev
        ? false
        : {
            useDefaults: true,
            directives: {
              defaultSrc: ["'self'"],
              scriptSrc: ["'self'"],
              styleSrc: ["'self'", "'unsafe-inline'"],
              imgSrc: ["'self'", 'data:', 'blob:'],
              fontSrc: ["'self'"],
              connectSrc: ["'self'"],
              objectSrc: ["'none'"],
              frameAncestors: ["'none'"],
              upgradeInsecureRequests: config.COOKIE_SECURE ? [] : null,
            },
          },
      strictTransportSecurity: config.COOKIE_SECURE,
    }),
  );
  // gzip for the client's files and the larger answers (the fleet register is about 1 MB of JSON at
  // 2,000 bikes, a tenth of that compressed); cached answers bring their own compressed copy.
  app.use(compression());

  const api = express.Router();
  // One line per API request at info, with a request id (the caller's X-Request-Id, or a new one)
  // that every line the request logs carries, and that the answer names.
  api.use(
    pinoHttp({
      logger: log,
      genReqId: (req, res) => {
        const given = req.headers['x-request-id'];
        const id = typeof given === 'string' && /^[\w.-]{1,100}$/.test(given) ? given : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : 'info'),
      serializers: { req: (r: { id: string; method: string; url: string }) => ({ id: r.id, method: r.method, url: r.url }), res: (r: { statusCode: number }) => ({ statusCode: r.statusCode }) },
    }),
  );
  api.use(express.json({ limit: '1mb' }));
  api.use(
    session({
      name: 'lashline.sid',
      secret: deps.sessionSecret,
      store: ctx.sessions,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.COOKIE_SECURE,
        maxAge: config.SESSION_IDLE_MINUTES * 60_000,
      },
    }),
  );
  api.use(sessionLifetime(ctx));
  const passport = createPassport(database.db, ctx.readCache);
  api.use(passport.initialize());
  api.use(passport.session());
  api.use(refuseCrossSite);
  api.use(csrfProtection(deps.jobToken));
  // A tablet that lost an answer sends the change again with the same key: it is applied once.
  api.use(idempotency(ctx));

  api.use('/health', healthRoutes(ctx));
  api.use('/auth', authRoutes(ctx, passport));
  api.use('/bikes', bikeRoutes(ctx));
  api.use('/', referenceRoutes(ctx));
  api.use('/admin/users', adminUserRoutes(ctx));
  api.use('/admin/mail', adminMailRoutes(ctx));
  api.use('/admin/jobs', adminJobRoutes(ctx));
  api.use('/', dueRoutes(ctx));
  api.use('/calendar', calendarRoutes(ctx));
  api.use('/tasks', taskRoutes(ctx));
  api.use('/', valveRoutes(ctx));
  api.use('/', planRoutes(ctx));
  api.use('/', settingsRoutes(ctx));
  api.use('/', importRoutes(ctx));
  api.use('/', recordRoutes(ctx));
  const blobStore = deps.blobStore ?? createMemoryBlobStore();
  api.use('/', backupRoutes(ctx, blobStore));
  api.use('/', attachmentRoutes(ctx, blobStore, { maxBytes: deps.uploadMaxBytes }));
  api.use('/', capacityRoutes(ctx));
  api.use('/', bookingRoutes(ctx));
  api.use('/plan', workshopPlanRoutes(ctx));
  api.use('/', partRoutes(ctx));
  api.use(apiNotFound);

  app.use('/api', api);
  deps.client?.(app);
  app.use(
    errorHandler((e, req) => {
      (req.log ?? log).error({ err: e, method: req.method, path: req.originalUrl }, 'Request failed');
    }),
  );
  assertEveryRouteRuled(app);
  return app;
}
