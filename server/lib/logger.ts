import pino from 'pino';

export function createLogger(level: string) {
  return pino({
    level,
    redact: { paths: ['req.headers.authorization', 'password', '*.password', 'token', '*.token'], censor: '[hidden]' },
  });
}
export type Logger = ReturnType<typeof createLogger>;
