import pino from 'pino';

/** The server's logger; secrets are censored wherever pino meets them. `destination` lets tests read the log. */
export function createLogger(level: string, destination?: pino.DestinationStream) {
  const options = {
    level,
    redact: { paths: ['req.headers.authorization', 'req.headers.cookie', 'password', '*.password', 'token', '*.token', 'passwordHash', '*.passwordHash'], censor: '[hidden]' },
  };
  return destination ? pino(options, destination) : pino(options);
}
export type Logger = ReturnType<typeof createLogger>;
