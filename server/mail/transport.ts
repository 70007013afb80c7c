import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';

export function createTransport(config: Config): Transporter {
  return nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    // The local capture server speaks plain SMTP; real relays should use SMTP_SECURE.
    ignoreTLS: !config.SMTP_SECURE && config.MAIL_CAPTURE,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASS ?? '' } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 10_000,
  });
}
