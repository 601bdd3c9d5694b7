import { roleLabels, roleRights, type RoomRole } from '../../../shared/protocol/index.js'
import { oneLine } from '../../lib/text-fields.js'
import type { OutgoingMail } from '../../mail/mailer.js'

// The same words the members list and the invite page show (shared/protocol/roles.ts).
const roleWords = (role: RoomRole): string => `${roleLabels[role].toLowerCase()} (${roleRights[role]})`

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c)

/** The invite e-mail, plain text first (the link on a line of its own) with an HTML twin. */
export function inviteMail(input: {
  to: string
  roomName: string
  role: RoomRole
  inviterName: string
  link: string
  expiresAt: Date
}): OutgoingMail {
  // Names stored before they were checked may hold line breaks: one line each, in text and subject.
  const p = { ...input, roomName: oneLine(input.roomName), inviterName: oneLine(input.inviterName) }
  const expires = p.expiresAt.toUTCString()
  const text = [
    `${p.inviterName} invited you to the Veilroom room "${p.roomName}" as ${roleWords(p.role)}.`,
    '',
    'Open this link to join (sign in or create an account first):',
    p.link,
    '',
    `The link works once and expires on ${expires}.`,
    'If you did not expect this invite, ignore this e-mail.',
  ].join('\n')
  const html =
    `<p>${escapeHtml(p.inviterName)} invited you to the Veilroom room “${escapeHtml(p.roomName)}” as ${escapeHtml(roleWords(p.role))}.</p>` +
    `<p><a href="${escapeHtml(p.link)}">Join the room</a></p>` +
    `<p>The link works once and expires on ${escapeHtml(expires)}. If you did not expect this invite, ignore this e-mail.</p>`
  return { to: p.to, subject: `${p.inviterName} invited you to "${p.roomName}" on Veilroom`, text, html }
}
