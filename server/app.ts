import express, { type Express } from 'express';
import helmet from 'helmet';
import path from 'node:path';
import { pinoHttp } from 'pino-http';
import type { DataSource } from 'typeorm';
import { auditRoutes } from './components/audit/routes';
import { AuditService } from './components/audit/service';
import { catalogueRoutes } from './components/catalogue/routes';
import { CatalogueService } from './components/catalogue/service';
import { imageRoutes } from './components/images/routes';
import { referenceRoutes } from './components/references/routes';
import { ReferencesService } from './components/references/service';
import { stationRoutes } from './components/stations/routes';
import { StationsService } from './components/stations/service';
import { KernelsService } from './components/kernels/service';
import { ruleRoutes } from './components/rules/routes';
import { RulesService } from './components/rules/service';
import { createRequireSignIn } from './components/auth/passport';
import { authRoutes } from './components/auth/routes';
import { AuthService } from './components/auth/service';
import { healthRoutes } from './components/health/routes';
import { userRoutes } from './components/users/routes';
import { UsersService } from './components/users/service';
import type { Config } from './config';
import { apiNotFound, errorHandler } from './lib/errors';
import { ImageUrlSigner } from './lib/image-urls';
import { LocalImageStore } from './lib/storage/local-store';
import type { Logger } from './lib/logger';

export interface AppDeps {
  config: Config;
  dataSource: DataSource;
  logger: Logger;
}

/** Builds the Express app (API + the exported web app); listening is main.ts's job. */
export function createApp({ config, dataSource, logger }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(pinoHttp({ logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }));

  const audit = new AuditService(dataSource);
  const auth = new AuthService(dataSource, audit, config.jwtSecret, config.tokenTtlSeconds);
  const requireSignIn = createRequireSignIn(auth, config.jwtSecret);
  const store = new LocalImageStore(config.imageDir);
  const signer = new ImageUrlSigner(config.jwtSecret);

  const api = express.Router();
  api.use(helmet({ contentSecurityPolicy: false }));
  api.use(express.json({ limit: '1mb' }));
  api.use('/health', healthRoutes(dataSource, config.version));
  api.use('/auth', authRoutes({ auth, requireSignIn, signInLimit: config.signInLimit }));
  // Signed addresses stand in for sign-in, so that <img> can load stored images.
  api.use('/images', imageRoutes(store, signer));
  // Everything below needs a signed-in user.
  api.use(requireSignIn);
  api.use('/users', userRoutes(new UsersService(dataSource, audit)));
  api.use('/audit-events', auditRoutes(dataSource, audit));
  api.use('/catalogue', catalogueRoutes(new CatalogueService(dataSource, audit)));
  const kernels = new KernelsService(dataSource);
  api.use(ruleRoutes(new RulesService(dataSource, audit, kernels)));
  api.use('/stations', stationRoutes(new StationsService(dataSource, audit)));
  api.use('/reference-sets', referenceRoutes(new ReferencesService(dataSource, store, signer, audit)));
  api.use(apiNotFound);
  app.use('/api', api);

  if (config.webDir) {
    const webDir = config.webDir;
    app.use(express.static(webDir, { index: false, maxAge: '1h' }));
    // Single-page app: every other path is a client route.
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(webDir, 'index.html')));
  }
  app.use(errorHandler);
  return app;
}
