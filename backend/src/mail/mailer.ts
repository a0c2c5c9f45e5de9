import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '../config/env';

let transporter: Transporter | undefined;

/** The SMTP transport: the local mail service in development and tests, the hospital's relay in production. */
export function mailer(): Transporter {
  if (!transporter) {
    const e = env();
    transporter = nodemailer.createTransport({
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      secure: e.SMTP_SECURE,
      ignoreTLS: !e.SMTP_SECURE && e.MAIL_CAPTURE,
      auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD ?? '' } : undefined,
      connectionTimeout: 5000,
      greetingTimeout: 5000,
      socketTimeout: 15000,
    });
  }
  return transporter;
}

export function resetMailer(): void {
  transporter?.close();
  transporter = undefined;
}

let lastCheck: { at: number; ok: boolean; message?: string } | undefined;

/** Whether the SMTP service answers (cached for 10 s so health checks stay cheap). */
export async function mailStatus(): Promise<{ ok: boolean; message?: string }> {
  if (lastCheck && Date.now() - lastCheck.at < 10_000) return { ok: lastCheck.ok, message: lastCheck.message };
  try {
    await mailer().verify();
    lastCheck = { at: Date.now(), ok: true };
  } catch (e) {
    lastCheck = { at: Date.now(), ok: false, message: (e as Error).message };
  }
  return { ok: lastCheck.ok, message: lastCheck.message };
}
