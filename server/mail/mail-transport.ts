import nodemailer, { type Transporter } from 'nodemailer';

const loopbackHosts = new Set(['127.0.0.1', 'localhost', '::1', '[::1]']);

/**
 * A nodemailer transport for `SMTP_URL`. `smtps://` is implicit TLS; `smtp://` upgrades with
 * STARTTLS when the server offers it, except on this machine's loopback address, where the local
 * mail catcher's certificate is not one to trust (nodemailer `ignoreTLS`).
 */
export function createMailTransport(smtpUrl: string): Transporter {
  const url = new URL(smtpUrl);
  const secure = url.protocol === 'smtps:';
  return nodemailer.createTransport({
    host: url.hostname,
    port: url.port ? Number(url.port) : secure ? 465 : 587,
    secure,
    ignoreTLS: !secure && loopbackHosts.has(url.hostname),
    auth: url.username
      ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) }
      : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
}
