import express, { type Express } from 'express';
import type { DataSource } from 'typeorm';
import helmet from 'helmet';
import path from 'node:path';
import { pinoHttp } from 'pino-http';
import { alertRoutes } from './components/alerts/routes';
import { auditRoutes } from './components/audit/routes';
import { createRequireSignIn } from './components/auth/passport';
import { authRoutes } from './components/auth/routes';
import { catalogueRoutes } from './components/catalogue/routes';
import { healthRoutes } from './components/health/routes';
import { imageRoutes } from './components/images/routes';
import { disputeRoutes } from './components/inspections/dispute-routes';
import { inspectionRoutes } from './components/inspections/routes';
import { kernelRoutes } from './components/kernels/routes';
import { previewRoutes } from './components/preview/routes';
import { recordRoutes } from './components/records/routes';
import { referenceRoutes } from './components/references/routes';
import { ruleRoutes } from './components/rules/routes';
import { stationRoutes } from './components/stations/routes';
import { studyRoutes } from './components/studies/routes';
import { trendRoutes } from './components/trends/routes';
import { trialRoutes } from './components/trials/routes';
import { userRoutes } from './components/users/routes';
import type { Config } from './config';
import { apiNotFound, createErrorHandler } from './lib/errors';
import { admissionLimit, corsForApp, uploadRateLimit } from './lib/http-guards';
import { PostgresRateLimitStore } from './lib/rate-limit-store';
import type { Logger } from './lib/logger';
import type { Services } from './services';

export interface AppDeps {
  config: Config;
  services: Services;
  logger: Logger;
}

/** True when the database does not answer a trivial query within two seconds. */
function databaseDown(dataSource: DataSource): Promise<boolean> {
  const probe = dataSource.query('select 1').then(() => false, () => true);
  const timeout = new Promise<boolean>((resolve) => setTimeout(() => resolve(true), 2000).unref());
  return Promise.race([probe, timeout]);
}

/** Builds the Express app (API + the exported web app); listening is main.ts's job. */
export function createApp({ config, services: s, logger }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(pinoHttp({ logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }));
  const requireSignIn = createRequireSignIn(s.auth, config.jwtSecret);

  const api = express.Router();
  api.use(helmet({ contentSecurityPolicy: false }));
  api.use(corsForApp(config.allowedOrigins));
  api.use(express.json({ limit: '1mb' }));
  api.use('/health', healthRoutes(s.dataSource, config.version));
  api.use('/auth', authRoutes({ auth: s.auth, requireSignIn, signInLimit: config.signInLimit, signInStore: new PostgresRateLimitStore(s.dataSource, 'sign-in') }));
  // Signed addresses stand in for sign-in, so that <img> can load stored images.
  api.use('/images', imageRoutes(s.store, s.signer));
  // Everything below needs a signed-in user.
  api.use(requireSignIn);
  api.use('/users', userRoutes(s.users));
  api.use('/audit-events', auditRoutes(s.dataSource, s.audit));
  api.use('/catalogue', catalogueRoutes(s.catalogue));
  api.use('/kernels', kernelRoutes(s.kernels));
  api.use('/stations', stationRoutes(s.stations));
  const uploads = uploadRateLimit(config.uploadsPerMinute, new PostgresRateLimitStore(s.dataSource, 'uploads'));
  api.use('/reference-sets', uploads, referenceRoutes(s.references));
  api.use(ruleRoutes(s.rules, s.ruleHistory));
  api.use(trialRoutes(s.trials));
  api.use('/preview', previewRoutes(s.preview));
  const inspectionAdmission = admissionLimit(config.maxInspectionsInFlight, 'The inspection server is busy; the photo waits and is sent again in a moment');
  api.use('/inspections', inspectionAdmission, uploads, inspectionRoutes(s.inspections));
  api.use('/disputes', disputeRoutes(s.inspections));
  api.use(recordRoutes(s.records));
  api.use('/trends', trendRoutes(s.trends));
  api.use(alertRoutes(s.alerts));
  api.use('/studies', studyRoutes(s.studies));
  api.use(apiNotFound);
  app.use('/api', api);

  if (config.webDir) {
    const webDir = config.webDir;
    app.use(express.static(webDir, { index: false, maxAge: '1h' }));
    // Single-page app: every other path is a client route.
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(webDir, 'index.html')));
  }
  app.use(createErrorHandler(() => databaseDown(s.dataSource)));
  return app;
}
