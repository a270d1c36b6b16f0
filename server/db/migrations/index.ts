import { Users1796146987773 } from './1796146987773-Users';
import { AuditTrail1796147129023 } from './1796147129023-AuditTrail';
import { PlantRulesInspections1796147286651 } from './1796147286651-PlantRulesInspections';
import { MailOutbox1796153281173 } from './1796153281173-MailOutbox';
import { AccountLockout1796157769215 } from './1796157769215-AccountLockout';
import { TrendsAlertsStudies1796157815152 } from './1796157815152-TrendsAlertsStudies';
import { TrialAttempts1796159530837 } from './1796159530837-TrialAttempts';
import { RecordFilterIndexes1796159960777 } from './1796159960777-RecordFilterIndexes';
import { PartitionInspectionsByMonth1796169997481 } from './1796169997481-PartitionInspectionsByMonth';
import { SharedRateLimits1796170734337 } from './1796170734337-SharedRateLimits';
import { StationPartTypes1796170788720 } from './1796170788720-StationPartTypes';
import { StationPhotoSize1796172000000 } from './1796172000000-StationPhotoSize';

/** Migrations in the order they run. */
export const MIGRATIONS: Function[] = [Users1796146987773, AuditTrail1796147129023, PlantRulesInspections1796147286651, MailOutbox1796153281173, AccountLockout1796157769215, TrendsAlertsStudies1796157815152, TrialAttempts1796159530837, RecordFilterIndexes1796159960777, PartitionInspectionsByMonth1796169997481, SharedRateLimits1796170734337, StationPartTypes1796170788720, StationPhotoSize1796172000000];
