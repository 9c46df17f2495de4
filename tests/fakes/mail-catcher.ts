// The local SMTP catcher (MailDev) with its web inbox, on loopback only.
// `npm start` runs it for the demo; `npm test` runs its own on free ports and reads mail through its REST API.
import { MailDev } from "maildev";

export interface MailCatcher {
  smtpPort: number;
  webPort: number;
  inboxUrl: string;
  stop(): Promise<void>;
}

/** Starts MailDev; each catcher keeps its messages in its own folder so two runs never mix. */
export async function startMailCatcher(smtpPort: number, webPort: number, mailDirectory: string): Promise<MailCatcher> {
  const maildev = new MailDev({
    smtp: smtpPort,
    web: webPort,
    ip: "127.0.0.1",
    webIp: "127.0.0.1",
    mailDirectory,
    silent: true,
  });
  await maildev.start();
  return {
    smtpPort,
    webPort,
    inboxUrl: `http://127.0.0.1:${webPort}/`,
    stop: () => maildev.stop(),
  };
}

export interface CaughtMail {
  id: string;
  subject: string;
  to: { address: string }[];
  text?: string;
  html?: string;
}

/** Every message the catcher holds, newest last. */
export async function listCaughtMail(webPort: number): Promise<CaughtMail[]> {
  const response = await fetch(`http://127.0.0.1:${webPort}/api/email`);
  if (!response.ok) throw new Error(`mail catcher answered ${response.status}`);
  return (await response.json()) as CaughtMail[];
}
