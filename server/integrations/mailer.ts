import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config.js';

/** nodemailer over SMTP from configuration; a relay in production, the local capture in development. */
export function createMailer(config: Config): Transporter {
  return nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    ignoreTLS: !config.SMTP_SECURE && config.SMTP_HOST === '127.0.0.1',
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 15000,
  });
}
