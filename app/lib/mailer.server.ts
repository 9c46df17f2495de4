// Every e-mail Bendwise sends goes through `sendMail`, which puts it on the mail queue in PostgreSQL
// (app/lib/mail/queue.server.ts) and returns; the mail worker hands it to the SMTP server in SMTP_URL
// with `deliverNow`, retrying with exponential backoff while that server is down, so nothing is lost.
// Callers keep calling `sendMail` as before: it resolves once the e-mail is safely queued.
import nodemailer, { type Transporter } from "nodemailer";
import { serverEnv } from "~/env.server";
import { MAIL_QUEUE, mailJobOptions, mailQueue } from "~/lib/mail/queue.server";

export interface OutgoingMail {
  to: string;
  subject: string;
  /** Plain text, for every mail reader and for screen readers that prefer it. */
  text: string;
  html: string;
  /** Extra headers, e.g. List-Unsubscribe on the weekly summary. */
  headers?: Record<string, string>;
}

/** An SMTP connection for a server address; a refused or silent server fails the attempt within seconds. */
export function smtpTransport(smtpUrl: string): Transporter {
  return nodemailer.createTransport({ url: smtpUrl, connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 } as never);
}

let transport: Transporter | undefined;

function transporter(): Transporter {
  transport ??= smtpTransport(serverEnv().SMTP_URL);
  return transport;
}

/** Queues an e-mail; the mail worker sends it. Resolves once it is stored in PostgreSQL. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  const boss = await mailQueue();
  const job: OutgoingMail = { to: mail.to, subject: mail.subject, text: mail.text, html: mail.html, ...(mail.headers ? { headers: mail.headers } : {}) };
  await boss.send(MAIL_QUEUE, job, mailJobOptions());
  if (serverEnv().BENDWISE_MAIL_WORKER === "in-process") {
    // Integration tests: this process sends its own queue, woken at once instead of at the next poll.
    const { inProcessMailWorker } = await import("~/lib/mail/in-process.server");
    (await inProcessMailWorker()).wake();
  }
}

/** Hands one e-mail to the SMTP server now; throws when it is refused. Only the mail worker calls this. */
export async function deliverNow(mail: OutgoingMail, via: Transporter = transporter()): Promise<void> {
  await via.sendMail({ from: serverEnv().MAIL_FROM, ...mail });
}

const escapeHtml = (s: string) =>
  s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");

/**
 * Bendwise's look for e-mail: paper background, the Literata-style serif heading, one spruce button,
 * and the same words in plain text. Styles are inline because mail readers drop style sheets.
 */
export function renderEmail(parts: {
  heading: string;
  paragraphs: string[];
  button?: { label: string; url: string };
  /** Small print under the button, e.g. why this mail came and what to do if it was not asked for. */
  footnote?: string;
  /** Sections after the paragraphs: a small heading and a list of lines each (e.g. one per child). */
  sections?: { heading: string; lines: string[] }[];
  /** A small link after the footnote, e.g. "Stop these summaries". */
  smallLink?: { label: string; url: string };
}): { text: string; html: string } {
  const { heading, paragraphs, button, footnote, sections = [], smallLink } = parts;
  const text = [
    heading,
    "",
    ...paragraphs.flatMap((p) => [p, ""]),
    ...sections.flatMap((s) => [s.heading, ...s.lines.map((line) => `- ${line}`), ""]),
    ...(button ? [`${button.label}:`, button.url, ""] : []),
    ...(footnote ? [footnote, ""] : []),
    ...(smallLink ? [`${smallLink.label}:`, smallLink.url, ""] : []),
    "— Bendwise: hands-on labs on how materials stretch, bend and break.",
  ].join("\n");

  const p = (s: string) =>
    `<p style="margin:0 0 16px;font-size:17px;line-height:1.55;color:#1c2726">${escapeHtml(s)}</p>`;
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>${escapeHtml(heading)}</title></head>
<body style="margin:0;padding:0;background:#fbf8f1;font-family:'Atkinson Hyperlegible','Segoe UI',Arial,sans-serif">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:#fbf8f1"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:560px;background:#ffffff;border:1px solid #d9d2c3;border-radius:12px">
<tr><td style="padding:20px 24px;border-bottom:1px solid #d9d2c3">
<span style="font-family:Literata,Georgia,'Times New Roman',serif;font-size:21px;font-weight:600;color:#0d5c57">Bendwise</span>
</td></tr>
<tr><td style="padding:24px">
<h1 style="margin:0 0 16px;font-family:Literata,Georgia,'Times New Roman',serif;font-size:24px;line-height:1.25;color:#1c2726">${escapeHtml(heading)}</h1>
${paragraphs.map(p).join("\n")}
${sections
  .map(
    (s) => `<h2 style="margin:20px 0 8px;font-family:Literata,Georgia,'Times New Roman',serif;font-size:19px;line-height:1.3;color:#1c2726">${escapeHtml(s.heading)}</h2>
<ul style="margin:0 0 16px;padding-left:20px;font-size:16px;line-height:1.55;color:#1c2726">${s.lines.map((line) => `<li style="margin:0 0 6px">${escapeHtml(line)}</li>`).join("")}</ul>`,
  )
  .join("\n")}
${
  button
    ? `<p style="margin:24px 0"><a href="${escapeHtml(button.url)}" style="display:inline-block;background:#0d5c57;color:#ffffff;font-weight:700;text-decoration:none;padding:12px 20px;border-radius:8px">${escapeHtml(button.label)}</a></p>
<p style="margin:0 0 16px;font-size:14px;line-height:1.5;color:#46524f">If the button does not work, copy this address into your browser:<br><a href="${escapeHtml(button.url)}" style="color:#0d5c57;word-break:break-all">${escapeHtml(button.url)}</a></p>`
    : ""
}
${footnote ? `<p style="margin:16px 0 0;font-size:14px;line-height:1.5;color:#46524f">${escapeHtml(footnote)}</p>` : ""}
${smallLink ? `<p style="margin:8px 0 0;font-size:14px;line-height:1.5"><a href="${escapeHtml(smallLink.url)}" style="color:#0d5c57">${escapeHtml(smallLink.label)}</a></p>` : ""}
</td></tr>
<tr><td style="padding:16px 24px;border-top:1px solid #d9d2c3;font-size:13px;color:#46524f">Bendwise — hands-on labs on how materials stretch, bend and break.</td></tr>
</table></td></tr></table>
</body></html>`;
  return { text, html };
}
