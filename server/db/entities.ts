import { AlertEntity, AlertLimitEntity, AlertSubscriptionEntity } from '../components/alerts/entities';
import { AuditEventEntity } from '../components/audit/entities';
import { UserEntity } from '../components/auth/entities';
import { DefectKindEntity, PartTypeEntity } from '../components/catalogue/entities';
import { DisputeEntity, InspectionEntity, MeasurementEntity } from '../components/inspections/entities';
import { CustomKernelEntity } from '../components/kernels/entities';
import { OutboxMessageEntity } from '../components/mail/entities';
import { ReferenceImageEntity, ReferenceSetEntity } from '../components/references/entities';
import { RuleEntity, RuleVersionEntity, SignatureEntity } from '../components/rules/entities';
import { LineEntity, StationEntity, StationPartTypeEntity } from '../components/stations/entities';
import { RepeatabilityPhotoEntity, RepeatabilityStudyEntity } from '../components/studies/entities';
import { TrialEntity, TrialResultEntity } from '../components/trials/entities';
import { InspectionFailureHourEntity, InspectionHourEntity } from '../components/trends/entities';

/** Every TypeORM entity of the server, registered in one place. */
export const ENTITIES = [
  UserEntity,
  AuditEventEntity,
  PartTypeEntity,
  DefectKindEntity,
  LineEntity,
  StationEntity,
  StationPartTypeEntity,
  CustomKernelEntity,
  RuleEntity,
  RuleVersionEntity,
  SignatureEntity,
  ReferenceSetEntity,
  ReferenceImageEntity,
  TrialEntity,
  TrialResultEntity,
  InspectionEntity,
  MeasurementEntity,
  DisputeEntity,
  OutboxMessageEntity,
  InspectionHourEntity,
  InspectionFailureHourEntity,
  AlertEntity,
  AlertLimitEntity,
  AlertSubscriptionEntity,
  RepeatabilityStudyEntity,
  RepeatabilityPhotoEntity,
];
