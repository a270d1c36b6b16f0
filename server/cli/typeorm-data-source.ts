// Data source for the TypeORM command line (migration:generate / migration:show), e.g.
// DATABASE_URL=... TS_NODE_PROJECT=server/tsconfig.json npx typeorm-ts-node-commonjs migration:generate -d server/cli/typeorm-data-source.ts server/db/migrations/Name
import { makeDataSource } from '../db/data-source';

export default makeDataSource(process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/kernwright');
