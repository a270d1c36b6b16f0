import { AuditEventEntity } from '../components/audit/entities';
import { UserEntity } from '../components/auth/entities';

/** Every TypeORM entity of the server, registered in one place. */
export const ENTITIES = [UserEntity, AuditEventEntity];
