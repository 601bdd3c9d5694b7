import { createHash, randomBytes, randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { Invite, RoomRole } from '../../db/entities/index.js'
import { AppError, notFound } from '../../lib/app-error.js'
import { logger } from '../../lib/logger.js'
import type { Mailer } from '../../mail/mailer.js'
import { roleCovers } from '../../../shared/protocol/index.js'
import { inviteMail } from './invite-mail.js'
import { invitesRepository, locked } from './invites-repository.js'
import type { CreateInviteBody } from './invites-schema.js'

/** Invites are valid for 7 days and can be used once. */
export const INVITE_DAYS = 7

/** 32 random bytes (256 bits) as base64url; only the SHA-256 hex of it is stored. */
export const newInviteToken = () => randomBytes(32).toString('base64url')
export const hashInviteToken = (token: string) => createHash('sha256').update(token).digest('hex')

const inviteNotFound = () =>
  notFound('invite_not_found', 'This invite link is not valid: check that the whole link was copied.')

/** 410 with a reason when the invite can no longer be used; revoked wins over used over expired. */
function assertUsable(invite: Invite, now = new Date()): void {
  if (invite.revokedAt)
    throw new AppError('invite_revoked', 410, 'This invite was withdrawn by the room owner. Ask them for a new one.')
  if (invite.acceptedAt)
    throw new AppError('invite_used', 410, 'This invite has already been used. Each invite link works once.')
  if (invite.expiresAt.getTime() <= now.getTime()) {
    throw new AppError(
      'invite_expired',
      410,
      `This invite expired on ${invite.expiresAt.toISOString()}. Ask the room owner for a new one.`,
    )
  }
}

export interface InviteDeps {
  dataSource: DataSource
  mailer: Mailer
  /** Links in mail are built from this, never from the request's Host header. */
  publicUrl: string
}

export function invitesService({ dataSource, mailer, publicUrl }: InviteDeps) {
  const repo = invitesRepository(dataSource)
  const base = publicUrl.replace(/\/+$/, '')

  return {
    /** Stores the invite and mails the link; if the mail cannot be sent the invite is dropped (502). */
    async create(roomId: string, input: CreateInviteBody, inviter: { id: string; name: string }) {
      const existing = await repo.userByEmail(input.email)
      if (existing && (await repo.membership(roomId, existing.id))) {
        throw new AppError(
          'already_member',
          409,
          'This person is already a member of the room; change their role instead.',
          'email',
        )
      }
      const token = newInviteToken()
      const invite = {
        id: randomUUID(),
        roomId,
        email: input.email,
        role: input.role,
        tokenHash: hashInviteToken(token),
        expiresAt: new Date(Date.now() + INVITE_DAYS * 24 * 3600 * 1000),
        invitedById: inviter.id,
      }
      await repo.insert(invite)
      const roomName = await repo.roomName(roomId)
      try {
        await mailer.send(
          inviteMail({
            to: input.email,
            roomName,
            role: input.role,
            inviterName: inviter.name,
            link: `${base}/invite/${token}`,
            expiresAt: invite.expiresAt,
          }),
        )
      } catch (err) {
        await repo.deleteById(invite.id)
        logger.warn('invite mail failed', { roomId, err: String(err) })
        throw new AppError(
          'mail_failed',
          502,
          'The invite e-mail could not be sent; nothing was saved. Try again later.',
        )
      }
      return { id: invite.id, email: invite.email, role: invite.role, expiresAt: invite.expiresAt.toISOString() }
    },

    async listPending(roomId: string) {
      const rows = await repo.listPending(roomId)
      return rows.map((i) => ({
        id: i.id,
        email: i.email,
        role: i.role,
        expiresAt: i.expiresAt.toISOString(),
        createdAt: i.createdAt.toISOString(),
        invitedBy: i.invitedBy ? { id: i.invitedBy.id, name: i.invitedBy.name } : null,
      }))
    },

    async revoke(roomId: string, inviteId: string): Promise<void> {
      const invite = await repo.findInRoom(roomId, inviteId)
      if (!invite) throw notFound('invite_not_found', 'No such invite in this room.')
      await repo.revoke(inviteId)
    },

    /** What the invite page shows before accepting; no membership needed, the token is the key. */
    async preview(token: string) {
      const invite = await repo.findByHash(hashInviteToken(token))
      if (!invite) throw inviteNotFound()
      assertUsable(invite)
      return {
        roomName: invite.room?.name ?? '',
        role: invite.role,
        email: invite.email,
        invitedBy: invite.invitedBy?.name ?? '',
        expiresAt: invite.expiresAt.toISOString(),
      }
    },

    /**
     * Uses the invite once (the row is locked, so two tabs cannot both accept) and makes the user a
     * member; an existing member keeps the higher of the two roles. Only the account with the
     * invited address may accept (403 invite_other_address, and the invite stays usable): a
     * forwarded or leaked link does not let another account in, nor raise a viewer to owner.
     */
    async accept(token: string, user: { id: string; email: string }): Promise<{ roomId: string; role: RoomRole }> {
      const userId = user.id
      return dataSource.transaction(async (em) => {
        const q = locked(em)
        const invite = await q.inviteByHash(hashInviteToken(token))
        if (!invite) throw inviteNotFound()
        assertUsable(invite)
        if (invite.email.trim().toLowerCase() !== user.email.trim().toLowerCase()) {
          throw new AppError(
            'invite_other_address',
            403,
            `This invite was sent to ${invite.email}, and you are signed in as ${user.email}. Sign in with the invited address to accept it.`,
          )
        }
        await q.markAccepted(invite.id)
        const member = await q.membership(invite.roomId, userId)
        if (!member) {
          await q.insertMembership({ id: randomUUID(), roomId: invite.roomId, userId, role: invite.role })
          return { roomId: invite.roomId, role: invite.role }
        }
        if (roleCovers(member.role, invite.role)) return { roomId: invite.roomId, role: member.role }
        await q.setRole(member.id, invite.role)
        return { roomId: invite.roomId, role: invite.role }
      })
    },
  }
}

export type InvitesService = ReturnType<typeof invitesService>
