import type { OutgoingMail } from './mailer';

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function withLink(to: string, subject: string, paragraphs: string[], link: string, after: string[]): OutgoingMail {
  const text = [...paragraphs, '', link, '', ...after].join('\n');
  const html = [
    ...paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    `<p><a href="${escapeHtml(link)}">${escapeHtml(link)}</a></p>`,
    ...after.map((p) => `<p>${escapeHtml(p)}</p>`),
  ].join('\n');
  return { to, subject, text, html };
}

/** The invitation a manager sends: a link to choose a password, valid for `hours`. */
export function invitationMail(o: { to: string; name: string; invitedBy: string; roleLabel: string; link: string; hours: number }): OutgoingMail {
  return withLink(
    o.to,
    'You are invited to Halfmark',
    [`Hello ${o.name},`, `${o.invitedBy} has invited you to Halfmark as ${o.roleLabel}. Open this link to choose your password:`],
    o.link,
    [`The link works once and expires in ${o.hours} hours. If it has expired, ask your lab manager to send a new one.`, 'If you did not expect this, ignore this message.'],
  );
}

/** The password-reset message: a link to choose a new password, valid for `hours`. */
export function passwordResetMail(o: { to: string; name: string; link: string; hours: number }): OutgoingMail {
  return withLink(
    o.to,
    'Reset your Halfmark password',
    [`Hello ${o.name},`, 'Someone asked to reset the password of your Halfmark account. Open this link to choose a new one:'],
    o.link,
    [`The link works once and expires in ${o.hours} hours. Choosing a new password signs you out everywhere else.`, 'If you did not ask for this, ignore this message: your password stays as it is.'],
  );
}
