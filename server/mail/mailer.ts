import nodemailer, { type Transporter } from 'nodemailer';
import type { Logger } from 'pino';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** True while mail goes to the built-in fake (the outbox page is then available). */
  readonly fake: boolean;
}

export function createMailer(
  target: { host: string; port: number; user?: string; password?: string; secure: boolean; fake: boolean },
  from: string,
  log: Logger,
): Mailer & { close(): void } {
  const transport: Transporter = nodemailer.createTransport({
    host: target.host,
    port: target.port,
    secure: target.secure,
    auth: target.user ? { user: target.user, pass: target.password ?? '' } : undefined,
    // The fake has no certificate; a real server negotiates TLS as usual.
    ignoreTLS: target.fake,
  });
  return {
    fake: target.fake,
    async send(mail) {
      const info = await transport.sendMail({ from, ...mail });
      log.info({ to: mail.to, subject: mail.subject, messageId: info.messageId }, 'mail sent');
    },
    close: () => transport.close(),
  };
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** A plain, readable mail with one call-to-action link, as text and HTML. */
export function linkMail(to: string, subject: string, intro: string, linkLabel: string, url: string, outro: string): OutgoingMail {
  const text = `${intro}\n\n${linkLabel}: ${url}\n\n${outro}\n\n— Specimetry`;
  const html =
    `<p>${escapeHtml(intro)}</p><p><a href="${escapeHtml(url)}">${escapeHtml(linkLabel)}</a></p>` +
    `<p style="color:#555">${escapeHtml(outro)}</p><p>— Specimetry</p>`;
  return { to, subject, text, html };
}
