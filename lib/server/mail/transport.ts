import nodemailer, { type Transporter } from 'nodemailer';
import { getEnv, type Env } from '../../env';

const g = globalThis as unknown as { __veilmeterMail?: Transporter };

/**
 * Where mail goes: the local catcher (MAIL_CATCHER=1, development and tests: plain SMTP on
 * loopback, nothing leaves the machine) or the configured relay, authenticated when SMTP_USER is
 * set, over TLS unless SMTP_TLS=none. Null when neither is configured.
 */
export function transportOptions(env: Env = getEnv()) {
  if (env.MAIL_CATCHER === '1') return { host: '127.0.0.1', port: env.SMTP_PORT, secure: false, ignoreTLS: true, connectionTimeout: 5000 };
  if (!env.SMTP_HOST) return null;
  return {
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    // tls: TLS from the first byte (usually port 465); starttls: upgrade, and refuse to send in the clear
    secure: env.SMTP_TLS === 'tls',
    requireTLS: env.SMTP_TLS === 'starttls',
    ignoreTLS: env.SMTP_TLS === 'none',
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: 10_000,
  };
}

/** Whether mail can go anywhere: a relay is set or the local catcher was asked for. */
export function mailConfigured(env: Env = getEnv()): boolean {
  return transportOptions(env) !== null;
}

function transport(): Transporter {
  if (!g.__veilmeterMail) {
    const options = transportOptions();
    if (!options) throw new Error('No mail relay is configured: set SMTP_HOST (and SMTP_PORT, SMTP_USER, SMTP_PASSWORD, SMTP_TLS), or MAIL_CATCHER=1 for the local catcher');
    g.__veilmeterMail = nodemailer.createTransport(options);
  }
  return g.__veilmeterMail;
}

export type Mail = { to: string; subject: string; text: string; html?: string };

/** Sends one message over SMTP (the relay, or the local catcher in development and tests). */
export async function sendMail(mail: Mail): Promise<void> {
  await transport().sendMail({ from: getEnv().MAIL_FROM, ...mail });
}

/**
 * Sends without making the caller wait: for answers that must take the same time whether or not
 * a message went out (password reset, sign-up). A failure is logged, never shown.
 */
export function sendMailLater(mail: Mail): Promise<void> {
  return sendMail(mail).catch((err: unknown) => {
    console.error(`[veilmeter] mail "${mail.subject}" could not be sent: ${err instanceof Error ? err.message : String(err)}`);
  });
}
