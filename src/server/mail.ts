import nodemailer, { type Transporter } from 'nodemailer';
import { env } from './env';
import { withZoneName } from '../lib/clock';

// E-mail: every message has a plain-text and an HTML part in Sunreckon's look, and is sent by
// nodemailer over SMTP (SMTP_URL). Nothing calls `deliver` directly except the outbox, so a
// message is never lost when the SMTP server is down.

export interface MailContent {
  subject: string;
  text: string;
  html: string;
  /** Extra header lines, such as List-Unsubscribe (never user-written text). */
  headers?: Record<string, string>;
}

export interface MailMessage extends MailContent {
  to: string;
}

/** What a message says, before it is rendered into its two parts. */
export interface MailParts {
  subject: string;
  /** The first line: "Hello Tobi,". */
  greeting: string;
  /** Paragraphs before the button. */
  intro: string[];
  action?: { label: string; url: string };
  /** Paragraphs after the button (expiry, "ignore this if…"). */
  outro?: string[];
}

const PALETTE = {
  dusk: '#2F3E55',
  slateText: '#4A6280',
  ember: '#B24C1C',
  sand: '#F5EDE0',
  sandDark: '#E6D8C1',
  card: '#FFFDF9',
};
const FONT = "Nunito, 'Segoe UI', Roboto, Helvetica, Arial, sans-serif";

function escapeHtml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** Renders a message into its plain-text and HTML parts (inline styles: mail clients drop style sheets). */
export function renderMail(parts: MailParts): MailContent {
  const text = [
    parts.greeting,
    '',
    ...parts.intro.flatMap((p) => [p, '']),
    ...(parts.action ? [`${parts.action.label}:`, parts.action.url, ''] : []),
    ...(parts.outro ?? []).flatMap((p) => [p, '']),
    '— Sunreckon, battery forecasts for dry camping',
  ].join('\n');

  const para = (p: string) => `<p style="margin:0 0 16px;font-size:16px;line-height:1.6;color:${PALETTE.dusk};">${escapeHtml(p)}</p>`;
  // Long link addresses must wrap on a phone instead of widening the card.
  const small = (p: string) => `<p style="margin:0 0 12px;font-size:14px;line-height:1.55;color:${PALETTE.slateText};word-break:break-word;overflow-wrap:anywhere;">${escapeHtml(p)}</p>`;
  const button = parts.action
    ? `<table role="presentation" cellpadding="0" cellspacing="0" style="margin:8px 0 24px;"><tr><td style="border-radius:10px;background:${PALETTE.ember};">` +
      `<a href="${escapeHtml(parts.action.url)}" style="display:inline-block;padding:12px 22px;font-family:${FONT};font-size:16px;font-weight:700;color:#ffffff;text-decoration:none;border-radius:10px;">${escapeHtml(parts.action.label)}</a>` +
      `</td></tr></table>` +
      small(`If the button does not work, paste this address into your browser: ${parts.action.url}`)
    : '';

  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(parts.subject)}</title></head>
<body style="margin:0;padding:0;background:${PALETTE.sand};font-family:${FONT};">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${PALETTE.sand};padding:24px 12px;"><tr><td align="center">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:560px;">
<tr><td style="padding:0 8px 14px;font-family:${FONT};font-size:20px;font-weight:800;color:${PALETTE.dusk};">
<span style="display:inline-block;width:14px;height:14px;border-radius:7px;background:${PALETTE.ember};vertical-align:middle;margin-right:8px;"></span>Sunreckon</td></tr>
<tr><td style="background:${PALETTE.card};border-radius:14px;border:1px solid ${PALETTE.sandDark};padding:28px 26px;font-family:${FONT};">
${para(parts.greeting)}
${parts.intro.map(para).join('\n')}
${button}
${(parts.outro ?? []).map(small).join('\n')}
</td></tr>
<tr><td style="padding:14px 8px;font-family:${FONT};font-size:13px;color:${PALETTE.slateText};">Sunreckon — battery forecasts for dry camping. Figures are estimates.</td></tr>
</table></td></tr></table>
</body></html>`;
  return { subject: parts.subject, text, html };
}

/** The crew invitation: who invites, to which crew, with which role, and the single-use link. */
export function invitationMail(p: { crewName: string; inviterName: string; role: string; url: string; expiresAt: Date }): MailContent {
  const what: Record<string, string> = {
    owner: 'manage the crew, its members and installers, and edit its rigs, loads and trips',
    editor: 'edit the crew’s rigs, loads and trips and save forecasts',
    viewer: 'see the crew’s rigs, loads, trips and forecasts',
  };
  // Names are the users' own words: never in the subject (a name could pose as a notice from us),
  // only in the body, quoted, where renderMail escapes them.
  return renderMail({
    subject: 'You are invited to a crew on Sunreckon',
    greeting: 'Hello,',
    intro: [
      `A Sunreckon user who signs as “${p.inviterName}” invited you to join their crew as ${p.role === 'viewer' ? 'a viewer' : `an ${p.role}`}: you will be able to ${what[p.role] ?? 'use the crew'}.`,
      `The crew’s name, in its members’ own words: “${p.crewName}”.`,
      'Open the link and sign in or create an account with this e-mail address.',
    ],
    action: { label: 'Join the crew', url: p.url },
    outro: [
      // The invitee's zone is not known yet (they may have no account): the time says it is UTC.
      `The link works once and expires on ${withZoneName(p.expiresAt, 'UTC', 'dayTimeYear')}.`,
      'If you were not expecting this, ignore this e-mail: nothing happens unless you open the link.',
    ],
  });
}

/** The password-reset link from better-auth's flow. */
export function passwordResetMail(p: { name: string; url: string; expiresInMinutes: number }): MailContent {
  return renderMail({
    subject: 'Reset your Sunreckon password',
    greeting: `Hello ${p.name},`,
    intro: ['Someone (hopefully you) asked to reset the password of your Sunreckon account.'],
    action: { label: 'Choose a new password', url: p.url },
    outro: [
      `The link works once and expires in ${p.expiresInMinutes} minutes.`,
      'If you did not ask for this, ignore this e-mail: your password stays as it is.',
    ],
  });
}

/** Tells an installer that a crew shared a rig with them. */
export function grantMail(p: { installerName: string; crewName: string; rigName: string; ownerName: string; url: string }): MailContent {
  return renderMail({
    subject: 'A crew shared a rig with you on Sunreckon',
    greeting: `Hello ${p.installerName},`,
    intro: [
      `A crew owner who signs as “${p.ownerName}” gave you access to their rig “${p.rigName}”: you can read its power system, loads, trips and saved forecasts, and prepare a proposal.`,
      `The crew’s name, in its members’ own words: “${p.crewName}”.`,
    ],
    action: { label: 'Open rigs shared with me', url: p.url },
    outro: ['The crew can withdraw this access at any time.'],
  });
}

let transporter: Transporter | null = null;

function transport(): Transporter {
  if (!env.SMTP_URL) throw new Error('SMTP_URL is not set, so e-mail cannot be sent; it stays in the outbox until SMTP_URL is set.');
  transporter ??= nodemailer.createTransport({
    url: env.SMTP_URL,
    // Fail fast when the server is down: the outbox retries later.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return transporter;
}

/**
 * Hands one message to the SMTP server; throws when it is not accepted. Only the outbox calls
 * this; it passes a Message-ID made from the outbox row, so a retry is recognisably the same message.
 */
export async function deliver(message: MailMessage, messageId: string): Promise<string> {
  const info = await transport().sendMail({ from: env.MAIL_FROM, to: message.to, subject: message.subject, text: message.text, html: message.html, messageId, ...(message.headers ? { headers: message.headers } : {}) });
  const rejected = info.rejected ?? [];
  if (rejected.length > 0) throw new Error(`The SMTP server refused ${rejected.map(String).join(', ')}.`);
  return info.messageId;
}
