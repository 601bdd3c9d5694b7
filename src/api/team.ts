/**
 * Team work around a room (issue 5): invites and members, pins, snapshots, files, dev mailbox.
 * Routes and reply shapes: server/modules/{invites,pins,snapshots,files}.
 * Replies are checked at the edge like api/schemas.ts does, so contract drift is one clear ApiError.
 */
import { z } from 'zod'
import {
  figuresSummarySchema,
  frameSchema,
  pinSchema,
  roomRoleSchema as roomRole,
  surfaceMeshJsonSchema,
  type SurfaceMesh,
} from '../../shared/protocol'
import type { Frame } from '../../shared/types'
import { request, type Member } from './http'

export type { Pin } from '../../shared/protocol'

const id = z.union([z.string().min(1), z.number().int()]).transform(String)
const person = z.object({ id, name: z.string() }).nullable().catch(null)
const num = z.number()

export const pendingInvite = z.object({
  id,
  email: z.string(),
  role: roomRole,
  expiresAt: z.string(),
  createdAt: z.string().optional(),
  invitedBy: person.optional(),
})
export type PendingInvite = z.infer<typeof pendingInvite>

export const invitePreview = z.object({
  roomName: z.string(),
  role: roomRole,
  email: z.string(),
  invitedBy: z.string(),
  expiresAt: z.string(),
})
export type InvitePreview = z.infer<typeof invitePreview>

/** The figures a snapshot list row carries (server keeps the full set in the snapshot itself). */
export const snapshotFigures = figuresSummarySchema
export type SnapshotFigures = z.infer<typeof snapshotFigures>

export const snapshotSummary = z.object({
  id,
  name: z.string(),
  note: z
    .string()
    .nullable()
    .transform((n) => n ?? ''),
  author: person,
  createdAt: z.string(),
  figures: snapshotFigures,
})
export type SnapshotSummary = z.infer<typeof snapshotSummary>

export const snapshotDetail = snapshotSummary.extend({ frame: frameSchema })
export type SnapshotDetail = z.infer<typeof snapshotDetail>

export const mailMessage = z.object({
  id,
  to: z.string(),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullish(),
  date: z.string(),
})
export type MailMessage = z.infer<typeof mailMessage>

export const underlayMeta = z.object({
  ax: num,
  ay: num,
  bx: num,
  by: num,
  distance: num,
  originX: num,
  originY: num,
  width: num.optional(),
  height: num.optional(),
})
export type UnderlayMeta = z.infer<typeof underlayMeta>

const replies = {
  invite: z.object({ invite: pendingInvite }),
  invites: z.object({ invites: z.array(pendingInvite) }),
  preview: z.object({ invite: invitePreview }),
  accepted: z.object({ roomId: id, role: roomRole }),
  member: z.object({ member: z.object({ userId: id, role: roomRole }) }),
  pin: z.object({ pin: pinSchema }),
  pins: z.object({ pins: z.array(pinSchema) }),
  snapshot: z.object({ snapshot: snapshotDetail }),
  snapshots: z.object({ snapshots: z.array(snapshotSummary) }),
  created: z.object({ snapshot: snapshotSummary }),
  surface: surfaceMeshJsonSchema,
  frame: z.object({ frame: frameSchema }),
  mailbox: z.object({ messages: z.array(mailMessage) }),
  underlay: z.object({ underlay: underlayMeta.nullable() }),
}

const enc = encodeURIComponent
/** URL prefix of a room's API. */
export const roomPath = (roomId: string): string => `/api/rooms/${enc(roomId)}`

// ── invites and members ──────────────────────────────────────────────────────────────────────
/** POST /api/rooms/:id/invites (owner): stores the invite and mails the link. */
export const createInvite = async (roomId: string, input: { email: string; role: Member['role'] }) =>
  (await request('POST', `${roomPath(roomId)}/invites`, input, replies.invite)).invite
/** GET /api/rooms/:id/invites (owner): not accepted, not revoked, not expired. */
export const listInvites = async (roomId: string) =>
  (await request('GET', `${roomPath(roomId)}/invites`, undefined, replies.invites)).invites
/** DELETE /api/rooms/:id/invites/:inviteId (owner). */
export const revokeInvite = (roomId: string, inviteId: string) =>
  request('DELETE', `${roomPath(roomId)}/invites/${enc(inviteId)}`, undefined, null)
/** GET /api/invites/:token: public preview; 404/410 with the reason when it cannot be used. */
export const previewInvite = async (token: string) =>
  (await request('GET', `/api/invites/${enc(token)}`, undefined, replies.preview)).invite
/** POST /api/invites/:token/accept (signed in). */
export const acceptInvite = (token: string) =>
  request('POST', `/api/invites/${enc(token)}/accept`, undefined, replies.accepted)
/** PATCH /api/rooms/:id/members/:userId (owner); 409 'last_owner' keeps one owner. */
export const changeMemberRole = async (roomId: string, userId: string, role: Member['role']) =>
  (await request('PATCH', `${roomPath(roomId)}/members/${enc(userId)}`, { role }, replies.member)).member
/** DELETE /api/rooms/:id/members/:userId (owner, or the member leaving). */
export const removeMember = (roomId: string, userId: string) =>
  request('DELETE', `${roomPath(roomId)}/members/${enc(userId)}`, undefined, null)

// ── pins ─────────────────────────────────────────────────────────────────────────────────────
/** GET /api/rooms/:id/pins (all statuses; the panel filters locally so live events fit in). */
export const listPins = async (roomId: string) =>
  (await request('GET', `${roomPath(roomId)}/pins?status=all`, undefined, replies.pins)).pins
/** POST /api/rooms/:id/pins (reviewer and up). */
export const createPin = async (
  roomId: string,
  input: { x: number; y: number; z: number; docVersion: number; body: string },
) => (await request('POST', `${roomPath(roomId)}/pins`, input, replies.pin)).pin
/** POST /api/rooms/:id/pins/:pinId/replies (reviewer and up). */
export const replyToPin = async (roomId: string, pinId: string, body: string) =>
  (await request('POST', `${roomPath(roomId)}/pins/${enc(pinId)}/replies`, { body }, replies.pin)).pin
/** PATCH /api/rooms/:id/pins/:pinId: { body } (author) or { resolved } (editor and up). */
export const patchPin = async (roomId: string, pinId: string, patch: { body?: string; resolved?: boolean }) =>
  (await request('PATCH', `${roomPath(roomId)}/pins/${enc(pinId)}`, patch, replies.pin)).pin
/** DELETE /api/rooms/:id/pins/:pinId (author). */
export const deletePin = (roomId: string, pinId: string) =>
  request('DELETE', `${roomPath(roomId)}/pins/${enc(pinId)}`, undefined, null)

// ── snapshots ────────────────────────────────────────────────────────────────────────────────
/** GET /api/rooms/:id/snapshots. */
export const listSnapshots = async (roomId: string) =>
  (await request('GET', `${roomPath(roomId)}/snapshots`, undefined, replies.snapshots)).snapshots
/** POST /api/rooms/:id/snapshots (editor and up); 409 'no_surface' when nothing has settled yet. */
export const saveSnapshot = async (roomId: string, input: { name: string; note: string }) =>
  (await request('POST', `${roomPath(roomId)}/snapshots`, input, replies.created)).snapshot
/** GET /api/rooms/:id/snapshots/:sid: with its frame. */
export const getSnapshot = async (roomId: string, sid: string) =>
  (await request('GET', `${roomPath(roomId)}/snapshots/${enc(sid)}`, undefined, replies.snapshot)).snapshot
/** DELETE /api/rooms/:id/snapshots/:sid (editor and up). */
export const deleteSnapshot = (roomId: string, sid: string) =>
  request('DELETE', `${roomPath(roomId)}/snapshots/${enc(sid)}`, undefined, null)
/** GET /api/rooms/:id/snapshots/:sid/surface, as typed arrays. */
export const getSnapshotSurface = (roomId: string, sid: string): Promise<SurfaceMesh> =>
  request('GET', `${roomPath(roomId)}/snapshots/${enc(sid)}/surface`, undefined, replies.surface)

// ── files ────────────────────────────────────────────────────────────────────────────────────
/** Download links (viewer and up); `snapshotId` gives the snapshot's files instead of the room's. */
export function downloadLinks(roomId: string, snapshotId?: string): { label: string; href: string }[] {
  const base = snapshotId ? `${roomPath(roomId)}/snapshots/${enc(snapshotId)}` : roomPath(roomId)
  return [
    { label: 'Frame (frame.json)', href: `${base}/frame.json` },
    { label: 'Surface mesh (surface.obj)', href: `${base}/surface.obj` },
    { label: 'Surface mesh (surface.stl)', href: `${base}/surface.stl` },
    { label: 'Figures (figures.csv)', href: `${base}/figures.csv` },
  ]
}
/** POST /api/rooms/:id/frame/import (editor and up): the server validates; the client writes it. */
export async function importFrame(roomId: string, file: File): Promise<Frame> {
  const form = new FormData()
  form.append('file', file)
  return (await request('POST', `${roomPath(roomId)}/frame/import`, form, replies.frame)).frame
}
/** PUT /api/rooms/:id/underlay (editor and up): PNG/JPEG and its scale. */
export async function uploadUnderlay(roomId: string, image: File, scale: Omit<UnderlayMeta, 'width' | 'height'>) {
  const form = new FormData()
  form.append('image', image)
  for (const [k, v] of Object.entries(scale)) form.append(k, String(v))
  return request('PUT', `${roomPath(roomId)}/underlay`, form, null)
}
/** GET /api/rooms/:id/underlay/meta; null when the room has none. */
export async function getUnderlayMeta(roomId: string): Promise<UnderlayMeta | null> {
  return (await request('GET', `${roomPath(roomId)}/underlay/meta`, undefined, replies.underlay)).underlay
}
/** DELETE /api/rooms/:id/underlay. */
export const deleteUnderlay = (roomId: string) => request('DELETE', `${roomPath(roomId)}/underlay`, undefined, null)

/** GET /api/dev/mailbox: the fake SMTP server's messages to the signed-in user (404 in production). */
export const devMailbox = async () => (await request('GET', '/api/dev/mailbox', undefined, replies.mailbox)).messages
