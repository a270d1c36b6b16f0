import type { DataSource, EntityManager } from 'typeorm';
import type { Alert, AlertLimit, AlertPage, AlertSubscription, CreateAlertLimit } from '../../../shared/api/alerts';
import { hasAnyRole } from '../../../shared/roles';
import { AppError, notFound } from '../../lib/errors';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import type { MailService } from '../mail/service';
import { decodeCursor, encodeCursor } from '../records/query';
import type { DailyCount, TrendsService } from '../trends/service';
import { AlertLimitEntity, AlertSubscriptionEntity } from './entities';
import { limitAlerts, runRuleAlerts, type AlertCandidate, type ApplicableLimit } from './signals';

export const ALERT_CHECK_QUEUE = 'alerts.check';

const DAY_MS = 86_400_000;
/** The alert check writes its audit events under this name. */
const CHECK_ACTOR = { id: null, name: 'alert check' };

const ALERT_SELECT = `
  select a.id, a.kind, a.rule_id, r.name as rule_name, a.station_id, s.name as station_name, l.name as line_name, a.signal,
         a.period_start, a.period_end, a.description, a.created_at, a.acknowledged_at, u.display_name as acknowledged_by,
         a.acknowledgement_note
  from alerts a
  join rules r on r.id = a.rule_id
  join stations s on s.id = a.station_id
  join lines l on l.id = s.line_id
  left join users u on u.id = a.acknowledged_by`;

interface AlertRow {
  id: string;
  kind: Alert['kind'];
  rule_id: string;
  rule_name: string;
  station_id: string;
  station_name: string;
  line_name: string;
  signal: string;
  period_start: Date;
  period_end: Date;
  description: string;
  created_at: Date;
  acknowledged_at: Date | null;
  acknowledged_by: string | null;
  acknowledgement_note: string | null;
}

function toAlert(row: AlertRow): Alert {
  return {
    id: row.id,
    kind: row.kind,
    ruleId: row.rule_id,
    ruleName: row.rule_name,
    stationId: row.station_id,
    stationName: row.station_name,
    lineName: row.line_name,
    signal: row.signal,
    periodStart: row.period_start.toISOString(),
    periodEnd: row.period_end.toISOString(),
    description: row.description,
    createdAt: row.created_at.toISOString(),
    acknowledgedAt: row.acknowledged_at?.toISOString() ?? null,
    acknowledgedBy: row.acknowledged_by,
    acknowledgementNote: row.acknowledgement_note,
  };
}

export interface AlertCheckOutcome {
  /** Rule × station series looked at. */
  series: number;
  /** New alerts recorded (signals seen before are not counted again). */
  raised: number;
}

/**
 * Alerts on a rule's defect fraction at a station: raised by a background check (run rules on the
 * daily p-chart, and the supervisors' limits), mailed once to the subscribed supervisors, acknowledged
 * with a note and kept.
 */
export class AlertsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly trends: TrendsService,
    private readonly lookbackDays: number,
    /** How often the background check runs. */
    readonly checkEveryMinutes: number,
  ) {}

  async get(id: string): Promise<Alert> {
    const [row] = (await this.dataSource.query(`${ALERT_SELECT} where a.id = $1`, [id])) as AlertRow[];
    if (!row) throw notFound('The alert');
    return toAlert(row);
  }

  /** Newest first, paged by keyset. */
  async list(state: 'open' | 'acknowledged' | 'all', after: string | undefined, limit: number): Promise<AlertPage> {
    const params: unknown[] = [];
    const where: string[] = [];
    if (state === 'open') where.push('a.acknowledged_at is null');
    if (state === 'acknowledged') where.push('a.acknowledged_at is not null');
    if (after) {
      const cursor = decodeCursor(after);
      params.push(cursor.createdAt, cursor.id);
      where.push(`(a.created_at, a.id) < ($${params.length - 1}::timestamptz, $${params.length}::uuid)`);
    }
    params.push(limit + 1);
    const rows = (await this.dataSource.query(
      `${ALERT_SELECT} ${where.length ? `where ${where.join(' and ')}` : ''} order by a.created_at desc, a.id desc limit $${params.length}`,
      params,
    )) as AlertRow[];
    const items = rows.slice(0, limit);
    const last = items.at(-1);
    return { items: items.map(toAlert), next: rows.length > limit && last ? encodeCursor(last.created_at, last.id) : null };
  }

  /** Records who looked at the alert and what was done; an alert is acknowledged once. */
  async acknowledge(actor: UserEntity, id: string, note: string): Promise<Alert> {
    await this.dataSource.transaction(async (manager) => {
      const [rows] = (await manager.query(
        `update alerts set acknowledged_at = now(), acknowledged_by = $2, acknowledgement_note = $3 where id = $1 and acknowledged_at is null returning id`,
        [id, actor.id, note],
      )) as [{ id: string }[], number];
      if (rows.length === 0) {
        const [existing] = await manager.query('select acknowledged_at from alerts where id = $1', [id]);
        if (!existing) throw notFound('The alert');
        throw new AppError('conflict', 'This alert is already acknowledged');
      }
      await this.audit.record(manager, { actor: actorOf(actor), action: 'alert.acknowledge', entityType: 'alert', entityId: id, details: { note } });
    });
    return this.get(id);
  }

  // ---- Limits ----

  private async limitDtos(where: string, params: unknown[]): Promise<AlertLimit[]> {
    const rows: { id: string; rule_id: string; rule_name: string; station_id: string | null; station_name: string | null; max_defect_fraction: number; created_by: string; created_at: Date }[] =
      await this.dataSource.query(
        `select al.id, al.rule_id, r.name as rule_name, al.station_id, s.name as station_name, al.max_defect_fraction, u.display_name as created_by, al.created_at
         from alert_limits al join rules r on r.id = al.rule_id left join stations s on s.id = al.station_id join users u on u.id = al.created_by
         where ${where} order by r.name, s.name nulls first`,
        params,
      );
    return rows.map((r) => ({
      id: r.id,
      ruleId: r.rule_id,
      ruleName: r.rule_name,
      stationId: r.station_id,
      stationName: r.station_name,
      maxDefectFraction: r.max_defect_fraction,
      createdBy: r.created_by,
      createdAt: r.created_at.toISOString(),
    }));
  }

  listLimits(): Promise<AlertLimit[]> {
    return this.limitDtos('true', []);
  }

  /** One limit per rule and station (or per rule for every station). */
  async createLimit(actor: UserEntity, input: CreateAlertLimit): Promise<AlertLimit> {
    const id = await this.dataSource.transaction(async (manager) => {
      // One writer at a time, so two supervisors cannot set the same limit twice.
      await manager.query('lock table alert_limits in share row exclusive mode');
      const [rule] = await manager.query('select name from rules where id = $1', [input.ruleId]);
      if (!rule) throw notFound('The rule');
      if (input.stationId && !(await manager.query('select 1 from stations where id = $1', [input.stationId])).length) throw notFound('The station');
      const [clash] = await manager.query('select 1 from alert_limits where rule_id = $1 and station_id is not distinct from $2', [input.ruleId, input.stationId]);
      if (clash) throw new AppError('conflict', `${rule.name} already has a limit ${input.stationId ? 'at this station' : 'for every station'}; delete it to set another`);
      const saved = await manager.save(manager.create(AlertLimitEntity, { ruleId: input.ruleId, stationId: input.stationId, maxDefectFraction: input.maxDefectFraction, createdBy: actor.id }));
      await this.audit.record(manager, {
        actor: actorOf(actor),
        action: 'alert-limit.create',
        entityType: 'alert-limit',
        entityId: saved.id,
        after: { ruleId: input.ruleId, stationId: input.stationId, maxDefectFraction: input.maxDefectFraction },
        details: { rule: rule.name, maxDefectFraction: input.maxDefectFraction },
      });
      return saved.id;
    });
    return (await this.limitDtos('al.id = $1', [id]))[0];
  }

  async deleteLimit(actor: UserEntity, id: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const limit = await manager.findOne(AlertLimitEntity, { where: { id }, lock: { mode: 'pessimistic_write' } });
      if (!limit) throw notFound('The alert limit');
      await manager.delete(AlertLimitEntity, { id });
      await this.audit.record(manager, {
        actor: actorOf(actor),
        action: 'alert-limit.delete',
        entityType: 'alert-limit',
        entityId: id,
        before: { ruleId: limit.ruleId, stationId: limit.stationId, maxDefectFraction: limit.maxDefectFraction },
      });
    });
  }

  // ---- Subscription ----

  /** Supervisors receive alert e-mails unless they turned them off; nobody else receives them. */
  async subscription(user: UserEntity): Promise<AlertSubscription> {
    if (!hasAnyRole(user.roles, ['supervisor'])) return { subscribed: false };
    const row = await this.dataSource.getRepository(AlertSubscriptionEntity).findOneBy({ userId: user.id });
    return { subscribed: row?.subscribed ?? true };
  }

  async setSubscription(user: UserEntity, subscribed: boolean): Promise<AlertSubscription> {
    await this.dataSource.transaction(async (manager) => {
      await manager.upsert(AlertSubscriptionEntity, { userId: user.id, subscribed, updatedAt: new Date() }, ['userId']);
      await this.audit.record(manager, { actor: actorOf(user), action: 'alert-subscription.change', entityType: 'user', entityId: user.id, after: { subscribed } });
    });
    return this.subscription(user);
  }

  // ---- The check ----

  /**
   * Looks at the last days of every released rule at every station where it judged parts: the daily
   * p-chart's Western Electric rules and the supervisors' limits. Each signal is recorded once (a unique
   * key on rule, station, signal and day), and the supervisors hear of new ones in one e-mail per rule
   * and station, written in the same transaction; running the check again, or twice at once, adds nothing.
   */
  async check(now: Date = new Date()): Promise<AlertCheckOutcome> {
    const today = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate());
    const from = new Date(today - (this.lookbackDays - 1) * DAY_MS);
    const rules: { id: string }[] = await this.dataSource.query(`select distinct rule_id as id from rule_versions where state = 'released'`);
    const counts = await this.trends.dailyCounts({ from, to: now }, rules.map((r) => r.id));
    const limits = await this.dataSource.getRepository(AlertLimitEntity).find();
    const series = new Map<string, DailyCount[]>();
    for (const count of counts) {
      const key = `${count.ruleId}/${count.stationId}`;
      series.set(key, [...(series.get(key) ?? []), count]);
    }
    let raised = 0;
    for (const days of series.values()) {
      const { ruleId, stationId } = days[0];
      const candidates = [...runRuleAlerts(days), ...limitAlerts(days, applicableLimit(limits, ruleId, stationId))];
      if (candidates.length) raised += await this.record(ruleId, stationId, candidates);
    }
    if (raised > 0) await this.mail.kick();
    return { series: series.size, raised };
  }

  /** Stores the candidates that are new and mails the subscribed supervisors about them; returns how many were new. */
  private async record(ruleId: string, stationId: string, candidates: AlertCandidate[]): Promise<number> {
    // The same order in every run, so that two checks at once wait for each other instead of deadlocking.
    const ordered = [...candidates].sort((a, b) => a.periodStart.getTime() - b.periodStart.getTime() || a.signal.localeCompare(b.signal));
    return this.dataSource.transaction(async (manager) => {
      const added: { id: string; description: string }[] = await manager.query(
        // Kept to the millisecond, as a page cursor (ISO 8601) gives it back.
        `insert into alerts (kind, rule_id, station_id, signal, period_start, period_end, description, created_at)
         select c.kind, $1, $2, c.signal, c.period_start, c.period_end, c.description, date_trunc('milliseconds', now())
         from unnest($3::text[], $4::text[], $5::timestamptz[], $6::timestamptz[], $7::text[]) with ordinality
              as c(kind, signal, period_start, period_end, description, position)
         order by c.position
         on conflict (rule_id, station_id, signal, period_start) do nothing
         returning id, description`,
        [
          ruleId,
          stationId,
          ordered.map((c) => c.kind),
          ordered.map((c) => c.signal),
          ordered.map((c) => c.periodStart.toISOString()),
          ordered.map((c) => c.periodEnd.toISOString()),
          ordered.map((c) => c.description),
        ],
      );
      if (added.length === 0) return 0;
      const [where] = await manager.query(
        `select r.name as rule, s.name as station, l.name as line from rules r, stations s join lines l on l.id = s.line_id where r.id = $1 and s.id = $2`,
        [ruleId, stationId],
      );
      await this.audit.record(manager, {
        actor: CHECK_ACTOR,
        action: 'alert.raise',
        entityType: 'alert',
        entityId: added[0].id,
        details: { rule: where.rule, station: where.station, alerts: added.map((a) => a.id) },
      });
      await this.mail.enqueue(manager, {
        to: await subscribedSupervisors(manager),
        subject: `Alert: ${where.rule} at ${where.station} (${where.line}), ${added.length} new signal${added.length === 1 ? '' : 's'}`,
        body:
          `The defect fraction of "${where.rule}" at ${where.station} (${where.line}) shows ${added.length === 1 ? 'a signal' : 'signals'} that the process may be out of control:\n\n` +
          added.map((a) => `- ${a.description}`).join('\n') +
          `\n\nOpen Kernwright's Trends area to see the chart and the inspections behind it, and acknowledge the alert with what was done.`,
      });
      return added.length;
    });
  }
}

/** The strictest limit that applies: the station's own or the one for every station. */
function applicableLimit(limits: readonly AlertLimitEntity[], ruleId: string, stationId: string): ApplicableLimit | null {
  const applying = limits.filter((l) => l.ruleId === ruleId && (l.stationId === null || l.stationId === stationId));
  if (applying.length === 0) return null;
  const strictest = applying.reduce((a, b) => (b.maxDefectFraction < a.maxDefectFraction ? b : a));
  return { maxDefectFraction: strictest.maxDefectFraction, scope: strictest.stationId ? 'station' : 'every station' };
}

async function subscribedSupervisors(manager: EntityManager): Promise<string[]> {
  const rows: { email: string }[] = await manager.query(
    `select u.email from users u left join alert_subscriptions s on s.user_id = u.id
     where u.active and 'supervisor' = any(u.roles) and u.email is not null and coalesce(s.subscribed, true)
     order by u.email`,
  );
  return rows.map((r) => r.email);
}
