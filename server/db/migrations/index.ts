import { Users1796146987773 } from './1796146987773-Users';

/** Migrations in the order they run. */
export const MIGRATIONS: Function[] = [Users1796146987773];
