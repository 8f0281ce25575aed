import type { Role } from '../../auth/permissions';
import { ROLE_LABELS } from '../../auth/permissions';
import type { Mail } from './transport';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function wrap(title: string, lines: string[], link: { href: string; label: string }): string {
  return `<!doctype html><html><body style="font-family:system-ui,sans-serif;color:#1b2430">
<h2 style="margin:0 0 12px">${esc(title)}</h2>${lines.map((l) => `<p>${esc(l)}</p>`).join('')}
<p><a href="${esc(link.href)}" style="background:#0d8076;color:#fff;padding:8px 14px;border-radius:6px;text-decoration:none">${esc(link.label)}</a></p>
<p style="color:#5c687a;font-size:12px">Or paste this address into your browser: ${esc(link.href)}</p></body></html>`;
}

export function invitationMail(to: string, labName: string, role: Role, inviter: string, link: string): Mail {
  const lines = [`${inviter} invited you to the lab “${labName}” on Veilmeter as ${ROLE_LABELS[role].toLowerCase()}.`, 'The link works once and expires in 7 days.'];
  return { to, subject: `Join ${labName} on Veilmeter`, text: `${lines.join('\n')}\n\nAccept: ${link}\n`, html: wrap(`Join ${labName}`, lines, { href: link, label: 'Accept the invitation' }) };
}

export function resetMail(to: string, link: string): Mail {
  const lines = ['Someone asked to reset the password of this Veilmeter account. If it was not you, ignore this message.', 'The link works once and expires in one hour.'];
  return { to, subject: 'Reset your Veilmeter password', text: `${lines.join('\n')}\n\nReset: ${link}\n`, html: wrap('Reset your password', lines, { href: link, label: 'Choose a new password' }) };
}

export function verifyMail(to: string, link: string): Mail {
  const lines = ['Someone started a lab on Veilmeter with this address. Open the link to confirm it is yours; until then the account can do nothing else.', 'If it was not you, ignore this message.', 'The link works once and expires in 48 hours.'];
  return { to, subject: 'Confirm your address for Veilmeter', text: `${lines.join('\n')}\n\nConfirm: ${link}\n`, html: wrap('Confirm your address', lines, { href: link, label: 'Confirm my address' }) };
}

/** To the owner of an address someone tried to sign up with again: no second account is made. */
export function accountExistsMail(to: string, signInLink: string, resetLink: string): Mail {
  const lines = [
    'Someone tried to start a lab on Veilmeter with this address, which already has an account. No second account was made.',
    `If it was you, sign in at ${signInLink} (or choose a new password with the link below). If it was not you, ignore this message.`,
  ];
  return { to, subject: 'You already have a Veilmeter account', text: `${lines.join('\n')}\n\nNew password: ${resetLink}\n`, html: wrap('You already have an account', lines, { href: resetLink, label: 'Choose a new password' }) };
}

/** To a lead: a new reading turned a revision to failing one or more of the project's targets. */
export function targetFailedMail(
  to: string,
  info: { projectName: string; revisionLabel: string; failures: { target: string; condition: string; mean: string; n: number }[]; link: string },
): Mail {
  const lines = [
    `Revision ${info.revisionLabel} of “${info.projectName}” now fails ${info.failures.length === 1 ? 'a target' : `${info.failures.length} targets`} after a new reading:`,
    ...info.failures.map((f) => `${f.target}${f.condition ? ` (${f.condition})` : ''}: mean ${f.mean} over ${f.n} capture set${f.n === 1 ? '' : 's'}.`),
    'Targets are judged on the mean of the newest reading of every capture set. You get this once when the revision turns to failing, not for every reading after.',
  ];
  return {
    to,
    subject: `${info.revisionLabel} fails a target · ${info.projectName}`,
    text: `${lines.join('\n')}\n\nOpen the revision: ${info.link}\n`,
    html: wrap(`${info.revisionLabel} fails a target`, lines, { href: info.link, label: 'Open the revision' }),
  };
}
