/**
 * Room roles and what each may do: the one table the HTTP guard, the sync endpoint, the socket
 * events and the client all read (PRODUCT.md "Words": owner / editor / reviewer / viewer).
 */
import { z } from 'zod'

/** Strongest first. */
export const roomRoles = ['owner', 'editor', 'reviewer', 'viewer'] as const
export type RoomRole = (typeof roomRoles)[number]
export const roomRoleSchema = z.enum(roomRoles)

/** Things a member may do in a room. */
export type RoomAction =
  /** see the room, its frame, surface, figures, pins, snapshots and downloads; leave it */
  | 'read'
  /** add pins and reply to them */
  | 'pin'
  /** mark a pin resolved or open it again */
  | 'resolvePin'
  /** move, add and remove frame points, change edges, prestress, element size; import a frame; site plan */
  | 'editFrame'
  /** save, delete and restore snapshots */
  | 'snapshot'
  /** change the room's name and description */
  | 'rename'
  /** invite people, change roles, remove members */
  | 'manageMembers'
  /** delete the room */
  | 'deleteRoom'

const permissions: Record<RoomRole, ReadonlySet<RoomAction>> = {
  owner: new Set(['read', 'pin', 'resolvePin', 'editFrame', 'snapshot', 'rename', 'manageMembers', 'deleteRoom']),
  editor: new Set(['read', 'pin', 'resolvePin', 'editFrame', 'snapshot', 'rename']),
  reviewer: new Set(['read', 'pin']),
  viewer: new Set(['read']),
}

/** True when `role` may do `action`. */
export const can = (role: RoomRole, action: RoomAction): boolean => permissions[role].has(action)

/** True when `role` has every right `other` has (an accepted invite never lowers a member's role). */
export const roleCovers = (role: RoomRole, other: RoomRole): boolean =>
  [...permissions[other]].every((action) => permissions[role].has(action))

/** Role names as the UI shows them. */
export const roleLabels: Record<RoomRole, string> = {
  owner: 'Owner',
  editor: 'Editor',
  reviewer: 'Reviewer',
  viewer: 'Viewer',
}

/** What each role may do, in the app's words (tooltips, members list, invite e-mail). */
export const roleRights: Record<RoomRole, string> = {
  owner: 'all rights: edits the frame, saves snapshots, adds and resolves pins, invites people and manages the room',
  editor: 'edits the frame, saves and restores snapshots, adds and resolves pins',
  reviewer: 'adds pins and replies; cannot change the frame',
  viewer: 'looks only: sees the surface, figures, pins and snapshots',
}
