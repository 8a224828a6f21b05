/**
 * The retention digest: once a day, at the lab's digest hour in its time zone, the clerks get one
 * e-mail listing what falls due in the next N days and how much may already go. Several servers
 * may run the scheduler; the job_runs row for the day is the claim, so only one of them sends.
 */
import { QueryTypes } from 'sequelize';
import { localDateOf, zoneOffsetMs } from '../../shared/domain/retention';
import type { DigestResult, DueItemView } from '../../shared/schemas/retention';
import type { AppContext } from '../app';
import { judgeRetainedItems } from '../commands/retention';
import { logger } from '../logger';
import type { OutgoingMail } from '../mail/mailer';

/** The job name in job_runs. */
export const DIGEST_JOB = 'retention-digest';

// A claim still "running" after this long belongs to a server that died while sending.
const STALE_CLAIM_MINUTES = 60;

/**
 * Claims a run of a job: true for the one caller that inserted (or took over a failed or stale)
 * row for this key, false for everyone else.
 */
export async function claimJobRun(ctx: AppContext, job: string, runKey: string): Promise<number | null> {
  const rows = await ctx.sequelize.query<{ id: number }>(
    `INSERT INTO job_runs (job, run_key, status) VALUES ($1, $2, 'running')
     ON CONFLICT (job, run_key) DO UPDATE SET status = 'running', attempts = job_runs.attempts + 1, started_at = now(), finished_at = NULL
      WHERE job_runs.status = 'failed'
         OR (job_runs.status = 'running' AND job_runs.started_at < now() - make_interval(mins => ${STALE_CLAIM_MINUTES}))
     RETURNING id`,
    { bind: [job, runKey], type: QueryTypes.SELECT },
  );
  return rows[0]?.id ?? null;
}

async function finishJobRun(ctx: AppContext, id: number, status: 'done' | 'failed', detail: Record<string, unknown>): Promise<void> {
  await ctx.sequelize.query(`UPDATE job_runs SET status = $2, finished_at = now(), detail = $3::jsonb WHERE id = $1`, {
    bind: [id, status, JSON.stringify(detail)],
  });
}

function line(item: DueItemView): string {
  const what = item.kind === 'half' ? `half of ${item.specimen ?? '?'}` : 'specimen';
  return `${item.firstDay ?? '—'}  ${item.code}  (${what}; order ${item.order}, heat ${item.heat}, ${item.customer})  at ${item.location}`;
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);
}

/** The digest message for one recipient. */
export function digestMail(o: {
  to: string;
  days: number;
  timeZone: string;
  dueSoon: readonly DueItemView[];
  dueNow: number;
  held: number;
  link: string | null;
}): OutgoingMail {
  const subject = `Retention: ${o.dueSoon.length} item${o.dueSoon.length === 1 ? '' : 's'} fall due in the next ${o.days} days`;
  const intro = [
    `These retained items reach their dispose-not-before date in the next ${o.days} days (dates in ${o.timeZone}):`,
  ];
  const list = o.dueSoon.length > 0 ? o.dueSoon.map(line) : ['(none)'];
  const after = [
    `${o.dueNow} item${o.dueNow === 1 ? ' is' : 's are'} already due and may be disposed of or returned.`,
    ...(o.held > 0 ? [`${o.held} item${o.held === 1 ? ' is' : 's are'} under a hold and may not go until the hold is released.`] : []),
    ...(o.link ? [`The due list: ${o.link}`] : []),
    'A disposal still needs each item scanned into a batch and your signature.',
  ];
  const text = [...intro, '', ...list, '', ...after].join('\n');
  const html = [
    `<p>${escapeHtml(intro[0] ?? '')}</p>`,
    `<ul>${list.map((l) => `<li><code>${escapeHtml(l)}</code></li>`).join('')}</ul>`,
    ...after.map((p) => `<p>${escapeHtml(p)}</p>`),
  ].join('\n');
  return { to: o.to, subject, text, html };
}

/** Who gets the digest: the active clerks, or the active managers when the lab has no clerk. */
async function recipients(ctx: AppContext): Promise<string[]> {
  const rows = await ctx.sequelize.query<{ email: string; role: string }>(
    `SELECT email, role FROM users WHERE active AND role IN ('clerk','manager') ORDER BY id`,
    { type: QueryTypes.SELECT },
  );
  const clerks = rows.filter((r) => r.role === 'clerk').map((r) => r.email);
  return clerks.length > 0 ? clerks : rows.map((r) => r.email);
}

/**
 * Sends the digest for the lab-local day of `now`, if no server has yet: claims the day's
 * job_runs row, judges every retained item, and mails each recipient. A failed send marks the
 * run failed so a later tick (on any server) tries again.
 */
export async function runRetentionDigest(ctx: AppContext, opts: { now: Date; days?: number }): Promise<DigestResult> {
  const { settings, items } = await judgeRetainedItems(ctx, opts.now);
  const runKey = localDateOf(opts.now, settings.timeZone);
  const days = opts.days ?? settings.digestDays;
  const claim = await claimJobRun(ctx, DIGEST_JOB, runKey);
  if (claim === null) return { outcome: 'skipped', runKey, recipients: [], dueSoon: 0, dueNow: 0 };
  try {
    const horizon = new Date(opts.now.getTime() + days * 86_400_000).toISOString();
    const dueSoon = items
      .filter((i) => i.status === 'not_due' && i.notBefore !== null && i.notBefore <= horizon)
      .sort((a, b) => (a.notBefore ?? '').localeCompare(b.notBefore ?? '') || a.code.localeCompare(b.code));
    const dueNow = items.filter((i) => i.status === 'may_go').length;
    const held = items.filter((i) => i.status === 'held').length;
    if (dueSoon.length === 0 && dueNow === 0) {
      await finishJobRun(ctx, claim, 'done', { outcome: 'empty', days });
      return { outcome: 'empty', runKey, recipients: [], dueSoon: 0, dueNow: 0 };
    }
    const to = await recipients(ctx);
    const base = ctx.config.PUBLIC_URL?.replace(/\/$/, '');
    const link = base ? `${base}/retention?within=${days}` : null;
    for (const address of to) {
      await ctx.mailer.send(digestMail({ to: address, days, timeZone: settings.timeZone, dueSoon, dueNow, held, link }));
    }
    await finishJobRun(ctx, claim, 'done', { outcome: 'sent', days, recipients: to.length, dueSoon: dueSoon.length, dueNow });
    return { outcome: 'sent', runKey, recipients: to, dueSoon: dueSoon.length, dueNow };
  } catch (error) {
    await finishJobRun(ctx, claim, 'failed', { error: error instanceof Error ? error.message : String(error) }).catch(() => undefined);
    throw error;
  }
}

/** Whether the lab's wall clock at `now` has reached the digest hour. */
export function digestHourReached(now: Date, timeZone: string, digestHour: number): boolean {
  const localMs = now.getTime() + zoneOffsetMs(now, timeZone);
  return new Date(localMs).getUTCHours() >= digestHour;
}

/** A running digest scheduler. */
export interface DigestScheduler {
  tick: () => Promise<DigestResult | null>;
  stop: () => void;
}

/**
 * Checks every `intervalMs` (with jitter, so servers do not all ask at once) whether today's
 * digest is due and unsent, and sends it. Errors are logged and retried at the next tick.
 */
export function startDigestScheduler(ctx: AppContext, intervalMs = 10 * 60_000): DigestScheduler {
  let running: Promise<DigestResult | null> | null = null;
  const tick = (): Promise<DigestResult | null> => {
    running ??= (async () => {
      const [row] = await ctx.sequelize.query<{ time_zone: string; digest_hour: number }>('SELECT time_zone, digest_hour FROM lab_settings WHERE id', {
        type: QueryTypes.SELECT,
      });
      const now = new Date();
      if (!row || !digestHourReached(now, row.time_zone, row.digest_hour)) return null;
      const result = await runRetentionDigest(ctx, { now });
      if (result.outcome === 'sent') logger.info({ runKey: result.runKey, recipients: result.recipients.length }, 'retention digest sent');
      return result;
    })()
      .catch((err: unknown) => {
        logger.error({ err }, 'the retention digest failed; will try again');
        return null;
      })
      .finally(() => {
        running = null;
      });
    return running;
  };
  const timer = setInterval(() => void tick(), intervalMs + Math.floor(Math.random() * 30_000));
  timer.unref();
  return { tick, stop: () => clearInterval(timer) };
}
