import nodemailer, { type Transporter } from 'nodemailer';
import { IsNull, LessThanOrEqual, type DataSource, type EntityManager } from 'typeorm';
import type { JobQueue } from '../../lib/jobs';
import { OutboxMessageEntity } from './entities';

export const OUTBOX_QUEUE = 'outbox.flush';

export interface SmtpSettings {
  host: string;
  port: number;
  from: string;
}

export interface OutgoingMessage {
  to: string[];
  subject: string;
  body: string;
}

/** Waits after a failed attempt: 30 s, 1 min, 2 min ... up to an hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(30_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
}

/** E-mail through the outbox: enqueue inside a change's transaction, send afterwards, retry until it goes. */
export class MailService {
  private readonly transport: Transporter;

  constructor(
    private readonly dataSource: DataSource,
    private readonly smtp: SmtpSettings,
    private readonly jobs: JobQueue | null,
  ) {
    this.transport = nodemailer.createTransport({ host: smtp.host, port: smtp.port, secure: false, ignoreTLS: true, connectionTimeout: 5000, greetingTimeout: 5000 });
  }

  async enqueue(manager: EntityManager, message: OutgoingMessage): Promise<void> {
    const to = [...new Set(message.to.filter(Boolean))];
    if (to.length === 0) return;
    await manager.insert(OutboxMessageEntity, { recipients: to, subject: message.subject.slice(0, 300), body: message.body });
  }

  /** Asks a worker to send what is waiting (call after the transaction that enqueued has committed). */
  async kick(): Promise<void> {
    if (this.jobs) await this.jobs.send(OUTBOX_QUEUE, {}, { retryLimit: 20 });
  }

  /** Sends every message that is due, one at a time; returns how many went and how many still wait. */
  async flush(): Promise<{ sent: number; waiting: number }> {
    let sent = 0;
    for (;;) {
      const outcome = await this.dataSource.transaction(async (manager) => {
        const [message] = await manager
          .createQueryBuilder(OutboxMessageEntity, 'm')
          .setLock('pessimistic_write')
          .setOnLocked('skip_locked')
          .where('m.sent_at is null and m.next_attempt_at <= now()')
          .orderBy('m.created_at', 'ASC')
          .take(1)
          .getMany();
        if (!message) return 'none' as const;
        try {
          await this.transport.sendMail({ from: this.smtp.from, to: message.recipients.join(', '), subject: message.subject, text: message.body });
          await manager.update(OutboxMessageEntity, { id: message.id }, { sentAt: new Date(), attempts: message.attempts + 1, lastError: null });
          return 'sent' as const;
        } catch (err) {
          const attempts = message.attempts + 1;
          await manager.update(OutboxMessageEntity, { id: message.id }, { attempts, lastError: String((err as Error).message).slice(0, 1000), nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)) });
          return 'failed' as const;
        }
      });
      if (outcome === 'sent') sent += 1;
      else break;
    }
    const waiting = await this.dataSource.getRepository(OutboxMessageEntity).countBy({ sentAt: IsNull() });
    return { sent, waiting };
  }

  /** Messages due now (the worker retries while any wait). */
  async due(): Promise<number> {
    return this.dataSource.getRepository(OutboxMessageEntity).countBy({ sentAt: IsNull(), nextAttemptAt: LessThanOrEqual(new Date()) });
  }
}
