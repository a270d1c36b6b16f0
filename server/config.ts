import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

/** Everything the server needs to know about its surroundings, read once from the environment. */
export interface Config {
  port: number;
  host: string;
  databaseUrl: string;
  dataDir: string;
  /** Folder of the local image store (content-addressed). */
  imageDir: string;
  jwtSecret: string;
  tokenTtlSeconds: number;
  /** Folder of the exported web app; null when the server runs the API alone. */
  webDir: string | null;
  signInLimit: { windowMs: number; maxFailures: number };
  /** Origins other than the app's own that may call the API from a browser (KW_ALLOWED_ORIGINS, comma-separated). */
  allowedOrigins: string[];
  /** Inspections worked on at once by this process; more are refused with 503 and Retry-After (load shedding). */
  maxInspectionsInFlight: number;
  /** Photo uploads allowed per person and minute (inspections and reference photos). */
  uploadsPerMinute: number;
  /** Consecutive failed sign-ins that lock an account, and for how long. */
  lockout: { failures: number; minutes: number };
  logLevel: string;
  version: string;
  smtp: { host: string; port: number; from: string };
  /** Start the stand-in mail server on loopback (the demo; off when a real SMTP host is set). */
  fakeSmtp: boolean;
  /** Hours (UTC) at which the plant's shifts start, ascending; trend charts per shift use them. Absent: DEFAULT_SHIFT_HOURS. */
  shiftHours?: number[];
  /** Days of history the alert check reads. Absent: DEFAULT_ALERT_LOOKBACK_DAYS. */
  alertLookbackDays?: number;
  /** Minutes between two alert checks. Absent: DEFAULT_ALERT_CHECK_MINUTES. */
  alertCheckMinutes?: number;
  /** What this process does (KW_ROLE): serve the API, run background jobs, or both. Absent: 'all'. */
  role?: ServerRole;
  /** Worker threads of this process's vision pool (KW_VISION_THREADS). Absent: one per CPU core. */
  visionThreads?: number;
  /** Images in an S3-compatible bucket (KW_STORAGE=s3) instead of the local folder imageDir. */
  s3?: S3Settings;
}

export const SERVER_ROLES = ['api', 'worker', 'all'] as const;
/** api: HTTP only (inspections and previews run in its own vision pool); worker: queued jobs only (trials, e-mail, alerts); all: both. */
export type ServerRole = (typeof SERVER_ROLES)[number];

export interface S3Settings {
  /** The S3 endpoint (KW_S3_ENDPOINT); null: a stand-in S3 server on loopback, as for the demo. */
  endpoint: string | null;
  bucket: string;
  region: string;
  /** Bucket name in the path (http://host/bucket/key) rather than in the host name, as most S3-compatible servers want. */
  pathStyle: boolean;
  /** Loopback port of the stand-in server when endpoint is null; it keeps objects under <dataDir>/s3. */
  standInPort: number;
}

export const DEFAULT_SHIFT_HOURS = [6, 14, 22];
export const DEFAULT_ALERT_LOOKBACK_DAYS = 30;
export const DEFAULT_ALERT_CHECK_MINUTES = 15;

function hoursFrom(value: string | undefined, fallback: number[], name: string): number[] {
  if (value === undefined || value.trim() === '') return fallback;
  const hours = value.split(',').map((h) => Number(h.trim()));
  if (hours.some((h, i) => !Number.isInteger(h) || h < 0 || h > 23 || (i > 0 && h <= hours[i - 1])))
    throw new Error(`${name} must be whole hours 0-23 in ascending order, separated by commas (e.g. 6,14,22), got "${value}"`);
  return hours;
}

const repoRoot = path.resolve(__dirname, '..', fs.existsSync(path.join(__dirname, '..', 'package.json')) ? '' : '..');

export function projectRoot(): string {
  return repoRoot;
}

function intFrom(value: string | undefined, fallback: number, name: string): number {
  if (value === undefined || value === '') return fallback;
  const parsed = Number(value);
  if (!Number.isInteger(parsed) || parsed <= 0) throw new Error(`${name} must be a positive whole number, got "${value}"`);
  return parsed;
}

/** The JWT secret is generated once and kept in the data directory, so tokens survive restarts. */
export function loadOrCreateSecret(dataDir: string): string {
  const file = path.join(dataDir, 'jwt-secret');
  if (fs.existsSync(file)) return fs.readFileSync(file, 'utf8').trim();
  fs.mkdirSync(dataDir, { recursive: true });
  const secret = crypto.randomBytes(48).toString('base64url');
  fs.writeFileSync(file, secret + '\n', { mode: 0o600, flag: 'wx' });
  return secret;
}

function roleFrom(value: string | undefined): ServerRole {
  if (value === undefined || value === '') return 'all';
  if (!(SERVER_ROLES as readonly string[]).includes(value)) throw new Error(`KW_ROLE must be one of ${SERVER_ROLES.join(', ')}, got "${value}"`);
  return value as ServerRole;
}

function s3From(env: NodeJS.ProcessEnv, port: number): S3Settings | undefined {
  const storage = env.KW_STORAGE || 'local';
  if (storage === 'local') return undefined;
  if (storage !== 's3') throw new Error(`KW_STORAGE must be local or s3, got "${storage}"`);
  return {
    endpoint: env.KW_S3_ENDPOINT || null,
    bucket: env.KW_S3_BUCKET || 'kernwright-images',
    region: env.KW_S3_REGION || 'us-east-1',
    pathStyle: env.KW_S3_PATH_STYLE !== '0',
    standInPort: intFrom(env.KW_FAKE_S3_PORT, port + 2000, 'KW_FAKE_S3_PORT'),
  };
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const dataDir = path.resolve(env.KW_DATA_DIR || path.join(repoRoot, '.data'));
  const pgPort = intFrom(env.KW_PG_PORT, 54329, 'KW_PG_PORT');
  const dbName = env.KW_DB_NAME || 'kernwright';
  const webDir = path.resolve(env.KW_WEB_DIR || path.join(repoRoot, 'dist'));
  const pkg = JSON.parse(fs.readFileSync(path.join(repoRoot, 'package.json'), 'utf8')) as { version: string };
  return {
    port: intFrom(env.PORT, 8081, 'PORT'),
    host: env.KW_HOST || '127.0.0.1',
    databaseUrl: env.DATABASE_URL || `postgres://postgres@127.0.0.1:${pgPort}/${dbName}`,
    dataDir,
    imageDir: path.resolve(env.KW_IMAGE_DIR || path.join(dataDir, 'images')),
    jwtSecret: env.KW_JWT_SECRET || loadOrCreateSecret(dataDir),
    tokenTtlSeconds: intFrom(env.KW_TOKEN_TTL_SECONDS, 12 * 3600, 'KW_TOKEN_TTL_SECONDS'),
    webDir: fs.existsSync(path.join(webDir, 'index.html')) ? webDir : null,
    signInLimit: {
      windowMs: intFrom(env.KW_SIGN_IN_WINDOW_MS, 15 * 60 * 1000, 'KW_SIGN_IN_WINDOW_MS'),
      maxFailures: intFrom(env.KW_SIGN_IN_MAX_FAILURES, 10, 'KW_SIGN_IN_MAX_FAILURES'),
    },
    allowedOrigins: (env.KW_ALLOWED_ORIGINS ?? '').split(',').map((o) => o.trim()).filter(Boolean),
    uploadsPerMinute: intFrom(env.KW_UPLOADS_PER_MINUTE, 120, 'KW_UPLOADS_PER_MINUTE'),
    maxInspectionsInFlight: intFrom(env.KW_MAX_INSPECTIONS_IN_FLIGHT, 16, 'KW_MAX_INSPECTIONS_IN_FLIGHT'),
    lockout: {
      failures: intFrom(env.KW_LOCKOUT_FAILURES, 5, 'KW_LOCKOUT_FAILURES'),
      minutes: intFrom(env.KW_LOCKOUT_MINUTES, 15, 'KW_LOCKOUT_MINUTES'),
    },
    logLevel: env.KW_LOG_LEVEL || 'info',
    version: pkg.version,
    smtp: {
      host: env.KW_SMTP_HOST || '127.0.0.1',
      // Beside the app's own port by default, so two checkouts side by side do not collide.
      port: intFrom(env.KW_SMTP_PORT, intFrom(env.PORT, 8081, 'PORT') + 1000, 'KW_SMTP_PORT'),
      from: env.KW_MAIL_FROM || 'Kernwright <kernwright@fernwick.example>',
    },
    fakeSmtp: !env.KW_SMTP_HOST && env.KW_FAKE_SMTP !== '0',
    shiftHours: hoursFrom(env.KW_SHIFT_HOURS, DEFAULT_SHIFT_HOURS, 'KW_SHIFT_HOURS'),
    alertLookbackDays: intFrom(env.KW_ALERT_LOOKBACK_DAYS, DEFAULT_ALERT_LOOKBACK_DAYS, 'KW_ALERT_LOOKBACK_DAYS'),
    alertCheckMinutes: intFrom(env.KW_ALERT_CHECK_MINUTES, DEFAULT_ALERT_CHECK_MINUTES, 'KW_ALERT_CHECK_MINUTES'),
    role: roleFrom(env.KW_ROLE),
    visionThreads: env.KW_VISION_THREADS ? intFrom(env.KW_VISION_THREADS, 1, 'KW_VISION_THREADS') : undefined,
    s3: s3From(env, intFrom(env.PORT, 8081, 'PORT')),
  };
}
