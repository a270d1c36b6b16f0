import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { ENTITIES } from './entities';
import { MIGRATIONS } from './migrations';

/** synchronize is always off: the schema changes only through migrations. */
export function makeDataSource(url: string, options: { poolSize?: number } = {}): DataSource {
  return new DataSource({
    type: 'postgres',
    url,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    uuidExtension: 'pgcrypto',
    synchronize: false,
    migrationsRun: false,
    logging: false,
    extra: { max: options.poolSize ?? 10, connectionTimeoutMillis: 5000 },
  });
}
