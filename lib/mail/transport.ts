import nodemailer, { type Transporter } from 'nodemailer';
import { getEnv } from '../env';

const g = globalThis as unknown as { __veilmeterMail?: Transporter };

function transport(): Transporter {
  if (!g.__veilmeterMail) {
    const env = getEnv();
    g.__veilmeterMail = nodemailer.createTransport({ host: env.SMTP_HOST, port: env.SMTP_PORT, secure: false, ignoreTLS: env.SMTP_HOST === '127.0.0.1', connectionTimeout: 5000 });
  }
  return g.__veilmeterMail;
}

export type Mail = { to: string; subject: string; text: string; html?: string };

/** Sends one message over SMTP (the local catcher in development and tests). */
export async function sendMail(mail: Mail): Promise<void> {
  await transport().sendMail({ from: getEnv().MAIL_FROM, ...mail });
}
