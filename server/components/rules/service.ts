import { In, type DataSource, type EntityManager } from 'typeorm';
import type { z } from 'zod';
import type {
  createRuleRequestSchema,
  listRulesQuerySchema,
  releaseRequestSchema,
  RuleDetail,
  RuleSummary,
  RuleVersion,
  Signature,
} from '../../../shared/api/rules';
import { isSentBack } from '../../../shared/api/rules';
import type { RuleDocument } from '../../../shared/rules/schema';
import { validateRuleDocument } from '../../../shared/rules/schema';
import { trialCautions } from '../../../shared/rules/trial-cautions';
import { digestOf } from '../../lib/digest';
import { AppError, notFound } from '../../lib/errors';
import type { AuditService } from '../audit/service';
import { UserEntity } from '../auth/entities';
import { verifyPassword } from '../auth/passwords';
import { actorOf } from '../auth/service';
import { PartTypeEntity } from '../catalogue/entities';
import type { KernelsService } from '../kernels/service';
import type { MailService } from '../mail/service';
import type { TrialSummary } from '../../../shared/api/trials';
import { TrialEntity } from '../trials/entities';
import { RuleEntity, RuleVersionEntity, SignatureEntity, type SignatureMeaning } from './entities';

type CreateRule = z.output<typeof createRuleRequestSchema>;
type ListRules = z.output<typeof listRulesQuerySchema>;
type Release = z.output<typeof releaseRequestSchema>;

const OPEN_STATES = ['draft', 'in-review'] as const;

/** What a signature covers: the version, its exact content, who, when and why (21 CFR 11.50, 11.70 describe the idea). */
export function signatureHashOf(s: Pick<SignatureEntity, 'ruleVersionId' | 'contentHash' | 'signerId' | 'signerName' | 'meaning' | 'signedAt'>): string {
  return digestOf({ ruleVersionId: s.ruleVersionId, contentHash: s.contentHash, signerId: s.signerId, signerName: s.signerName, meaning: s.meaning, signedAt: s.signedAt.toISOString() });
}

export class RulesService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly kernels: KernelsService,
    private readonly mail: MailService,
  ) {}

  private async ruleName(manager: EntityManager, version: RuleVersionEntity): Promise<string> {
    return (await manager.findOneByOrFail(RuleEntity, { id: version.ruleId })).name;
  }

  private async emailOf(manager: EntityManager, userId: string): Promise<string | null> {
    return (await manager.findOneBy(UserEntity, { id: userId }))?.email ?? null;
  }

  /** Validates a rule document with the shared schema and checks that every named kernel exists. */
  async checkDocument(document: unknown): Promise<RuleDocument> {
    const validation = validateRuleDocument(document);
    if (!validation.ok) {
      const issues = validation.issues.map((i) => ({ path: i.path === '(root)' ? 'document' : `document.${i.path}`, message: i.message }));
      throw new AppError('validation_failed', `${issues[0].path}: ${issues[0].message}`, { issues });
    }
    const library = await this.kernels.library();
    const issues = validation.rule.steps.flatMap((step, i) =>
      step.op === 'kernel' && 'kernel' in step && typeof step.kernel === 'string' && !library.has(step.kernel)
        ? [{ path: `document.steps[${i}].kernel`, message: `No kernel named "${step.kernel}" in the library` }]
        : [],
    );
    if (issues.length) throw new AppError('validation_failed', `${issues[0].path}: ${issues[0].message}`, { issues });
    return validation.rule;
  }

  private async names(ids: (string | null)[]): Promise<Map<string, string>> {
    const unique = [...new Set(ids.filter((id): id is string => !!id))];
    const users = unique.length ? await this.dataSource.getRepository(UserEntity).findBy({ id: In(unique) }) : [];
    return new Map(users.map((u) => [u.id, u.displayName]));
  }

  private async versionDtos(versions: RuleVersionEntity[], ruleNames: Map<string, string>): Promise<RuleVersion[]> {
    const ids = versions.map((v) => v.id);
    const signatures = ids.length ? await this.dataSource.getRepository(SignatureEntity).find({ where: { ruleVersionId: In(ids) }, order: { signedAt: 'ASC' } }) : [];
    const names = await this.names(versions.flatMap((v) => [v.authorId, v.reviewerId]));
    return versions.map((v) => ({
      id: v.id,
      ruleId: v.ruleId,
      ruleName: ruleNames.get(v.ruleId) ?? '',
      number: v.number,
      state: v.state,
      document: v.document,
      contentHash: v.contentHash,
      author: { id: v.authorId, name: names.get(v.authorId) ?? 'unknown' },
      authorNote: v.authorNote,
      editedAt: v.editedAt.toISOString(),
      submittedAt: v.submittedAt?.toISOString() ?? null,
      submittedTrialId: v.submittedTrialId,
      reviewer: v.reviewerId ? { id: v.reviewerId, name: names.get(v.reviewerId) ?? 'unknown' } : null,
      reviewedAt: v.reviewedAt?.toISOString() ?? null,
      reviewNote: v.reviewNote,
      releasedAt: v.releasedAt?.toISOString() ?? null,
      endedAt: v.endedAt?.toISOString() ?? null,
      withdrawReason: v.withdrawReason,
      signatures: signatures.filter((s) => s.ruleVersionId === v.id).map((s) => this.signatureDto(s, v)),
    }));
  }

  private signatureDto(s: SignatureEntity, version: RuleVersionEntity): Signature {
    const valid = s.contentHash === version.contentHash && s.contentHash === digestOf(version.document) && signatureHashOf(s) === s.signatureHash;
    return { id: s.id, signerId: s.signerId, signerName: s.signerName, meaning: s.meaning, signedAt: s.signedAt.toISOString(), contentHash: s.contentHash, signatureHash: s.signatureHash, valid };
  }

  private brief(v: RuleVersionEntity) {
    return { id: v.id, number: v.number, state: v.state, editedAt: v.editedAt.toISOString(), sentBack: isSentBack(v) };
  }

  private async summaries(rules: RuleEntity[]): Promise<RuleSummary[]> {
    const ids = rules.map((r) => r.id);
    const versions = ids.length ? await this.dataSource.getRepository(RuleVersionEntity).find({ where: { ruleId: In(ids) }, order: { number: 'DESC' } }) : [];
    const names = await this.names(rules.map((r) => r.createdBy));
    const lastTrials = await this.lastTrials(versions);
    return rules.map((r) => {
      const own = versions.filter((v) => v.ruleId === r.id);
      const released = own.find((v) => v.state === 'released');
      return {
        id: r.id,
        name: r.name,
        partType: r.partType,
        smallestDefectMm: r.smallestDefectMm,
        createdBy: { id: r.createdBy, name: names.get(r.createdBy) ?? 'unknown' },
        createdAt: r.createdAt.toISOString(),
        latestVersion: this.brief(own[0]),
        releasedVersion: released ? this.brief(released) : null,
        lastTrial: lastTrials.get(r.id) ?? null,
      };
    });
  }

  /** The newest trial per rule, across its versions. */
  private async lastTrials(versions: RuleVersionEntity[]): Promise<Map<string, RuleSummary['lastTrial']>> {
    if (versions.length === 0) return new Map();
    const byVersion = new Map(versions.map((v) => [v.id, v]));
    const trials = await this.dataSource
      .getRepository(TrialEntity)
      .createQueryBuilder('t')
      .distinctOn(['v.rule_id'])
      .innerJoin(RuleVersionEntity, 'v', 'v.id = t.rule_version_id')
      .where('t.rule_version_id IN (:...ids)', { ids: [...byVersion.keys()] })
      .orderBy('v.rule_id')
      .addOrderBy('t.created_at', 'DESC')
      .getMany();
    const result = new Map<string, RuleSummary['lastTrial']>();
    for (const trial of trials) {
      const version = byVersion.get(trial.ruleVersionId)!;
      const summary = trial.summary as TrialSummary | null;
      result.set(version.ruleId, {
        id: trial.id,
        versionNumber: version.number,
        state: trial.state,
        createdAt: trial.createdAt.toISOString(),
        agreement: summary?.agreement.rate ?? null,
        falseRejectRate: summary?.falseRejectRate.rate ?? null,
        escapeRate: summary?.escapeRate.rate ?? null,
      });
    }
    return result;
  }

  async list(query: ListRules, viewer: UserEntity): Promise<{ items: RuleSummary[]; total: number }> {
    const qb = this.dataSource.getRepository(RuleEntity).createQueryBuilder('r');
    if (query.q) qb.andWhere('r.name ILIKE :q', { q: `%${query.q.replace(/[\\%_]/g, (c) => '\\' + c)}%` });
    if (query.partType) qb.andWhere('r.part_type = :pt', { pt: query.partType });
    if (query.state) qb.andWhere('exists (select 1 from rule_versions v where v.rule_id = r.id and v.state = :state)', { state: query.state });
    if (query.owner) {
      const owner = query.owner === 'me' ? viewer.id : query.owner;
      qb.andWhere('(r.created_by = :owner or exists (select 1 from rule_versions ov where ov.rule_id = r.id and ov.author_id = :owner))', { owner });
    }
    const [rules, total] = await qb.orderBy('r.name', 'ASC').take(query.limit).skip(query.offset).getManyAndCount();
    return { items: await this.summaries(rules), total };
  }

  async detail(ruleId: string): Promise<RuleDetail> {
    const rule = await this.dataSource.getRepository(RuleEntity).findOneBy({ id: ruleId });
    if (!rule) throw notFound('The rule');
    const [summary] = await this.summaries([rule]);
    const versions = await this.dataSource.getRepository(RuleVersionEntity).find({ where: { ruleId }, order: { number: 'DESC' } });
    return { ...summary, versions: await this.versionDtos(versions, new Map([[rule.id, rule.name]])) };
  }

  async version(id: string): Promise<RuleVersion> {
    const version = await this.dataSource.getRepository(RuleVersionEntity).findOneBy({ id });
    if (!version) throw notFound('The rule version');
    const rule = await this.dataSource.getRepository(RuleEntity).findOneByOrFail({ id: version.ruleId });
    const [dto] = await this.versionDtos([version], new Map([[rule.id, rule.name]]));
    return dto;
  }

  async versionEntity(id: string): Promise<RuleVersionEntity> {
    const version = await this.dataSource.getRepository(RuleVersionEntity).findOneBy({ id });
    if (!version) throw notFound('The rule version');
    return version;
  }

  async create(actor: UserEntity, input: CreateRule): Promise<RuleDetail> {
    const document = await this.checkDocument(input.document);
    if (!(await this.dataSource.getRepository(PartTypeEntity).existsBy({ code: input.partType })))
      throw new AppError('validation_failed', `partType: unknown part type "${input.partType}"`, { issues: [{ path: 'partType', message: 'Unknown part type' }] });
    try {
      const ruleId = await this.dataSource.transaction(async (manager) => {
        const rule = await manager.save(manager.create(RuleEntity, { name: input.name, partType: input.partType, smallestDefectMm: input.smallestDefectMm, createdBy: actor.id }));
        const version = await manager.save(
          manager.create(RuleVersionEntity, { ruleId: rule.id, number: 1, state: 'draft', document, contentHash: digestOf(document), authorId: actor.id, editedAt: new Date() }),
        );
        await this.audit.record(manager, { actor: actorOf(actor), action: 'rule.create', entityType: 'rule', entityId: rule.id, after: { name: rule.name, partType: rule.partType }, details: { name: rule.name } });
        await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.create', entityType: 'rule-version', entityId: version.id, after: document, details: { rule: rule.name, number: 1 } });
        return rule.id;
      });
      return this.detail(ruleId);
    } catch (err) {
      if ((err as { code?: string }).code === '23505') throw new AppError('conflict', `A rule named "${input.name}" exists`, { issues: [{ path: 'name', message: 'Already taken' }] });
      throw err;
    }
  }

  private async lockVersion(manager: EntityManager, id: string): Promise<RuleVersionEntity> {
    const version = await manager.findOne(RuleVersionEntity, { where: { id }, lock: { mode: 'pessimistic_write' } });
    if (!version) throw notFound('The rule version');
    return version;
  }

  private static requireState(version: RuleVersionEntity, ...states: RuleVersionEntity['state'][]): void {
    if (!states.includes(version.state))
      throw new AppError('conflict', `Version ${version.number} is ${version.state}; this needs a version that is ${states.join(' or ')}`);
  }

  /** Saves a draft's document; only drafts change. */
  async saveDraft(actor: UserEntity, id: string, document: unknown, authorNote?: string): Promise<RuleVersion> {
    const checked = await this.checkDocument(document);
    await this.dataSource.transaction(async (manager) => {
      const version = await this.lockVersion(manager, id);
      RulesService.requireState(version, 'draft');
      const before = version.document;
      version.document = checked;
      version.contentHash = digestOf(checked);
      version.editedAt = new Date();
      version.authorId = actor.id;
      if (authorNote !== undefined) version.authorNote = authorNote;
      await manager.save(version);
      await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.save', entityType: 'rule-version', entityId: id, before, after: checked, details: { contentHash: version.contentHash } });
    });
    return this.version(id);
  }

  /** Starts a new draft from a version (by default the newest); a rule has at most one open draft or review. */
  async newDraft(actor: UserEntity, ruleId: string, fromVersionId?: string): Promise<RuleVersion> {
    const id = await this.dataSource.transaction(async (manager) => {
      await manager.query('select id from rules where id = $1 for update', [ruleId]);
      const versions = await manager.find(RuleVersionEntity, { where: { ruleId }, order: { number: 'DESC' } });
      if (versions.length === 0) throw notFound('The rule');
      const open = versions.find((v) => (OPEN_STATES as readonly string[]).includes(v.state));
      if (open) throw new AppError('conflict', `Version ${open.number} is still ${open.state}; finish it before starting another`, { openVersionId: open.id });
      const source = fromVersionId ? versions.find((v) => v.id === fromVersionId) : versions[0];
      if (!source) throw notFound('The version to start from');
      const draft = await manager.save(
        manager.create(RuleVersionEntity, { ruleId, number: versions[0].number + 1, state: 'draft', document: source.document, contentHash: source.contentHash, authorId: actor.id, editedAt: new Date() }),
      );
      await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.create', entityType: 'rule-version', entityId: draft.id, after: draft.document, details: { number: draft.number, from: source.number } });
      return draft.id;
    });
    return this.version(id);
  }

  /** Sends a draft for review; its latest trial must have run on exactly this content, after the last edit. */
  async submit(actor: UserEntity, id: string, note: string): Promise<RuleVersion> {
    await this.dataSource.transaction(async (manager) => {
      const version = await this.lockVersion(manager, id);
      RulesService.requireState(version, 'draft');
      const trial = await manager.findOne(TrialEntity, { where: { ruleVersionId: id }, order: { createdAt: 'DESC' } });
      if (!trial || trial.state !== 'done') throw new AppError('conflict', 'Run a trial of this draft on a reference set before submitting it');
      if (trial.contentHash !== version.contentHash || trial.createdAt < version.editedAt)
        throw new AppError('conflict', 'The draft changed after its latest trial; run the trial again before submitting');
      version.state = 'in-review';
      version.submittedAt = new Date();
      version.submittedTrialId = trial.id;
      version.authorId = actor.id;
      if (note) version.authorNote = note;
      version.reviewNote = null;
      await manager.save(version);
      await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.submit', entityType: 'rule-version', entityId: id, after: { state: 'in-review', trialId: trial.id }, details: { note } });
      const reviewers: { email: string }[] = await manager.query(`select email from users where active and 'supervisor' = any(roles) and email is not null and id <> $1`, [actor.id]);
      const name = await this.ruleName(manager, version);
      await this.mail.enqueue(manager, {
        to: reviewers.map((r) => r.email),
        subject: `Review requested: ${name}, version ${version.number}`,
        body: `${actor.displayName} submitted version ${version.number} of the rule "${name}" for review.\n\nNote: ${note || '(none)'}\n\nOpen Kernwright's Review area to release it or send it back.`,
      });
    });
    await this.mail.kick();
    return this.version(id);
  }

  /** Everyone who shaped a version: they may not release it (two-person rule). */
  private async contributors(manager: EntityManager, version: RuleVersionEntity): Promise<Set<string>> {
    const rows: { actor_id: string }[] = await manager.query(
      `select distinct actor_id from audit_events where entity_type = 'rule-version' and entity_id = $1 and action in ('rule-version.create', 'rule-version.save', 'rule-version.submit') and actor_id is not null`,
      [version.id],
    );
    return new Set([version.authorId, ...rows.map((r) => r.actor_id)]);
  }

  /**
   * Releases a version under review: a second person re-enters their password and signs with a
   * meaning; the signature is bound to the content hash; the rule's previous release is superseded.
   */
  async release(actor: UserEntity, id: string, input: Release): Promise<RuleVersion> {
    if (!(await verifyPassword(input.password, actor.passwordHash)))
      throw new AppError('validation_failed', 'password: the password is not right; nothing was signed', { issues: [{ path: 'password', message: 'Not your password' }] });
    await this.dataSource.transaction(async (manager) => {
      const version = await this.lockVersion(manager, id);
      RulesService.requireState(version, 'in-review');
      if ((await this.contributors(manager, version)).has(actor.id))
        throw new AppError('forbidden', 'You wrote or edited this version; another person must release it');
      if (digestOf(version.document) !== version.contentHash) throw new Error(`rule version ${id}: stored content does not match its hash`);
      const now = new Date();
      const previous = await manager.find(RuleVersionEntity, { where: { ruleId: version.ruleId, state: 'released' }, lock: { mode: 'pessimistic_write' } });
      for (const old of previous) {
        old.state = 'superseded';
        old.endedAt = now;
        await manager.save(old);
        await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.supersede', entityType: 'rule-version', entityId: old.id, after: { state: 'superseded' }, details: { by: version.id } });
      }
      // What the submitted trial said against the rule, kept with the release (the signer ticked it in the app).
      const trial = version.submittedTrialId ? await manager.findOneBy(TrialEntity, { id: version.submittedTrialId }) : null;
      const cautions = trial?.summary ? trialCautions(trial.summary as unknown as TrialSummary) : [];
      version.state = 'released';
      version.reviewerId = actor.id;
      version.reviewedAt = now;
      version.reviewNote = input.note || null;
      version.releasedAt = now;
      await manager.save(version);
      const signature = manager.create(SignatureEntity, {
        ruleVersionId: id,
        signerId: actor.id,
        signerName: actor.displayName,
        meaning: input.meaning as SignatureMeaning,
        signedAt: now,
        contentHash: version.contentHash,
      });
      signature.signatureHash = signatureHashOf(signature);
      await manager.save(signature);
      await this.audit.record(manager, {
        actor: actorOf(actor),
        action: 'rule-version.release',
        entityType: 'rule-version',
        entityId: id,
        after: { state: 'released', contentHash: version.contentHash },
        details: { meaning: input.meaning, signatureHash: signature.signatureHash, note: input.note, trialCautions: cautions },
      });
      const name = await this.ruleName(manager, version);
      await this.mail.enqueue(manager, {
        to: [(await this.emailOf(manager, version.authorId)) ?? ''],
        subject: `Released: ${name}, version ${version.number}`,
        body: `${actor.displayName} released version ${version.number} of the rule "${name}" (${input.meaning}) at ${now.toISOString()} UTC.\n\nNote: ${input.note || '(none)'}`,
      });
    });
    await this.mail.kick();
    return this.version(id);
  }

  async sendBack(actor: UserEntity, id: string, note: string): Promise<RuleVersion> {
    await this.dataSource.transaction(async (manager) => {
      const version = await this.lockVersion(manager, id);
      RulesService.requireState(version, 'in-review');
      if ((await this.contributors(manager, version)).has(actor.id)) throw new AppError('forbidden', 'You wrote or edited this version; another person must review it');
      version.state = 'draft';
      version.reviewerId = actor.id;
      version.reviewedAt = new Date();
      version.reviewNote = note;
      await manager.save(version);
      await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.send-back', entityType: 'rule-version', entityId: id, after: { state: 'draft' }, details: { note } });
      const name = await this.ruleName(manager, version);
      await this.mail.enqueue(manager, {
        to: [(await this.emailOf(manager, version.authorId)) ?? ''],
        subject: `Sent back: ${name}, version ${version.number}`,
        body: `${actor.displayName} sent version ${version.number} of the rule "${name}" back to draft.\n\nWhat must change: ${note}`,
      });
    });
    await this.mail.kick();
    return this.version(id);
  }

  async withdraw(actor: UserEntity, id: string, reason: string): Promise<RuleVersion> {
    await this.dataSource.transaction(async (manager) => {
      const version = await this.lockVersion(manager, id);
      RulesService.requireState(version, 'released', 'superseded');
      version.state = 'withdrawn';
      version.endedAt ??= new Date();
      version.withdrawReason = reason;
      await manager.save(version);
      await this.audit.record(manager, { actor: actorOf(actor), action: 'rule-version.withdraw', entityType: 'rule-version', entityId: id, after: { state: 'withdrawn' }, details: { reason } });
    });
    return this.version(id);
  }
}
