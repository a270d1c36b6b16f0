import type { DataSource } from 'typeorm';
import { AlertsService } from './components/alerts/service';
import { AuditService } from './components/audit/service';
import { AuthService } from './components/auth/service';
import { CatalogueService } from './components/catalogue/service';
import { InspectionsService } from './components/inspections/service';
import { KernelsService } from './components/kernels/service';
import { MailService } from './components/mail/service';
import { PreviewService } from './components/preview/service';
import { RecordsService } from './components/records/service';
import { ReferencesService } from './components/references/service';
import { RuleHistoryService } from './components/rules/history';
import { RulesService } from './components/rules/service';
import { StationsService } from './components/stations/service';
import { StudiesService } from './components/studies/service';
import { TrendsService } from './components/trends/service';
import { TrialsService } from './components/trials/service';
import { UsersService } from './components/users/service';
import { DEFAULT_ALERT_CHECK_MINUTES, DEFAULT_ALERT_LOOKBACK_DAYS, DEFAULT_SHIFT_HOURS, type Config } from './config';
import { ImageUrlSigner } from './lib/image-urls';
import type { JobQueue } from './lib/jobs';
import { openImageStore } from './lib/storage/open-store';
import type { ImageStore } from './lib/storage/image-store';
import type { PipelineRunner } from './vision/runner';

export interface ServiceDeps {
  config: Config;
  dataSource: DataSource;
  /** Worker threads that run pipelines. */
  pool: PipelineRunner;
  /** The background queue; null runs background work inline (tests, seeding). */
  jobs: JobQueue | null;
}

/** The composition root: every service, built once and shared by routes, job workers and the seed. */
export function createServices({ config, dataSource, pool, jobs }: ServiceDeps) {
  const audit = new AuditService(dataSource);
  const store: ImageStore = openImageStore(config);
  const signer = new ImageUrlSigner(config.jwtSecret);
  const kernels = new KernelsService(dataSource, audit);
  const mail = new MailService(dataSource, config.smtp, jobs);
  const rules = new RulesService(dataSource, audit, kernels, mail);
  const trials = new TrialsService(dataSource, store, signer, audit, pool, jobs);
  const inspections = new InspectionsService(dataSource, store, signer, audit, pool);
  const trends = new TrendsService(dataSource, config.shiftHours ?? DEFAULT_SHIFT_HOURS);
  return {
    dataSource,
    audit,
    store,
    signer,
    kernels,
    mail,
    auth: new AuthService(dataSource, audit, config.jwtSecret, config.tokenTtlSeconds, config.lockout),
    users: new UsersService(dataSource, audit),
    catalogue: new CatalogueService(dataSource, audit),
    stations: new StationsService(dataSource, audit),
    references: new ReferencesService(dataSource, store, signer, audit),
    rules,
    ruleHistory: new RuleHistoryService(dataSource, rules),
    preview: new PreviewService(dataSource, store, rules, pool),
    trials,
    inspections,
    records: new RecordsService(dataSource, store, audit, inspections, rules, trials, kernels),
    trends,
    alerts: new AlertsService(dataSource, audit, mail, trends, config.alertLookbackDays ?? DEFAULT_ALERT_LOOKBACK_DAYS, config.alertCheckMinutes ?? DEFAULT_ALERT_CHECK_MINUTES),
    studies: new StudiesService(dataSource, store, audit, pool),
  };
}
export type Services = ReturnType<typeof createServices>;
