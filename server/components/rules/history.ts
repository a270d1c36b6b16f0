import type { DataSource } from 'typeorm';
import type { RuleHistory, RuleHistoryEvent, RuleHistoryTrial, RuleHistoryVersion } from '../../../shared/api/rule-history';
import type { RuleVersion } from '../../../shared/api/rules';
import type { TrialSummary } from '../../../shared/api/trials';
import { diffRuleDocuments } from '../../../shared/rules/diff';
import type { RulesService } from './service';

/** Audit actions about a rule and its versions, as a reviewer reads them. */
const ACTION_LABELS: Record<string, string> = {
  'rule.create': 'Rule created',
  'rule-version.create': 'Version started',
  'rule-version.save': 'Draft saved',
  'rule-version.submit': 'Submitted for review',
  'rule-version.send-back': 'Sent back to draft',
  'rule-version.release': 'Released with a signature',
  'rule-version.supersede': 'Superseded by a newer release',
  'rule-version.withdraw': 'Withdrawn',
  'export.rule-version-pdf': 'Report printed (PDF)',
};

interface EventRow {
  seq: string;
  occurred_at: Date;
  actor_id: string | null;
  actor_name: string;
  action: string;
  entity_type: string;
  entity_id: string;
  details: Record<string, unknown>;
  after_digest: string | null;
}

interface TrialRow {
  id: string;
  rule_version_id: string;
  state: RuleHistoryTrial['state'];
  content_hash: string;
  summary: TrialSummary | null;
  created_at: Date;
  finished_at: Date | null;
  started_by: string;
  started_by_name: string | null;
  set_name: string | null;
}

const text = (value: unknown): string | null => (typeof value === 'string' && value.trim() !== '' ? value : null);

function eventOf(row: EventRow): RuleHistoryEvent {
  const d = row.details ?? {};
  return {
    seq: String(row.seq),
    occurredAt: row.occurred_at.toISOString(),
    action: row.action,
    label: ACTION_LABELS[row.action] ?? row.action,
    actor: { id: row.actor_id, name: row.actor_name },
    note: text(d.note) ?? text(d.reason),
    meaning: text(d.meaning),
    fromVersion: typeof d.from === 'number' ? d.from : null,
    afterDigest: row.after_digest,
  };
}

function trialOf(row: TrialRow, version: RuleVersion): RuleHistoryTrial {
  const s = row.summary;
  return {
    id: row.id,
    state: row.state,
    referenceSetName: row.set_name ?? '(reference set removed)',
    startedBy: { id: row.started_by, name: row.started_by_name ?? 'unknown' },
    createdAt: row.created_at.toISOString(),
    finishedAt: row.finished_at?.toISOString() ?? null,
    onCurrentContent: row.content_hash === version.contentHash,
    submitted: version.submittedTrialId === row.id,
    images: s?.images ?? null,
    agreement: s?.agreement.rate ?? null,
    falseRejectRate: s?.falseRejectRate.rate ?? null,
    escapeRate: s?.escapeRate.rate ?? null,
    kappa: s?.kappa ?? null,
  };
}

/**
 * The change history of one rule for auditors: every version with its state changes (from the
 * audit trail: who, when, note or meaning), signatures, trials and what changed from the version before.
 */
export class RuleHistoryService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly rules: RulesService,
  ) {}

  async history(ruleId: string): Promise<RuleHistory> {
    const rule = await this.rules.detail(ruleId);
    const versionIds = rule.versions.map((v) => v.id);
    // Names as people read them; the trail itself keeps the user name of the moment.
    const events: EventRow[] = await this.dataSource.query(
      `select e.seq, e.occurred_at, e.actor_id, coalesce(u.display_name, e.actor_name) as actor_name, e.action, e.entity_type, e.entity_id, e.details, e.after_digest
         from audit_events e left join users u on u.id = e.actor_id
        where (e.entity_type = 'rule-version' and e.entity_id = any($1::varchar[])) or (e.entity_type = 'rule' and e.entity_id = $2)
        order by e.seq`,
      [versionIds, ruleId],
    );
    const trials: TrialRow[] = versionIds.length
      ? await this.dataSource.query(
          `select t.id, t.rule_version_id, t.state, t.content_hash, t.summary, t.created_at, t.finished_at, t.started_by,
                  u.display_name as started_by_name, s.name as set_name
             from trials t left join users u on u.id = t.started_by left join reference_sets s on s.id = t.reference_set_id
            where t.rule_version_id = any($1::uuid[])
            order by t.created_at, t.id`,
          [versionIds],
        )
      : [];
    const byNumber = new Map(rule.versions.map((v) => [v.number, v]));
    const versions: RuleHistoryVersion[] = [...rule.versions]
      .sort((a, b) => b.number - a.number)
      .map((v) => {
        const previous = byNumber.get(v.number - 1);
        return {
          id: v.id,
          number: v.number,
          state: v.state,
          contentHash: v.contentHash,
          author: v.author,
          authorNote: v.authorNote,
          editedAt: v.editedAt,
          submittedAt: v.submittedAt,
          reviewer: v.reviewer,
          reviewedAt: v.reviewedAt,
          reviewNote: v.reviewNote,
          releasedAt: v.releasedAt,
          endedAt: v.endedAt,
          withdrawReason: v.withdrawReason,
          signatures: v.signatures,
          events: events.filter((e) => e.entity_type === 'rule-version' && e.entity_id === v.id).map(eventOf),
          trials: trials.filter((t) => t.rule_version_id === v.id).map((t) => trialOf(t, v)),
          changes: previous
            ? { fromNumber: previous.number, rows: diffRuleDocuments(previous.document, v.document).filter((row) => row.change !== 'same') }
            : null,
        };
      });
    return {
      rule: { id: rule.id, name: rule.name, partType: rule.partType, createdBy: rule.createdBy, createdAt: rule.createdAt },
      events: events.filter((e) => e.entity_type === 'rule').map(eventOf),
      versions,
    };
  }
}
