import type { RoomRole } from '../api/http'

/** Role labels shown in the UI, in order of rights (PRODUCT.md "Words"). */
export const roleLabels: Record<RoomRole, string> = {
  owner: 'Owner',
  editor: 'Editor',
  reviewer: 'Reviewer',
  viewer: 'Viewer',
}

/** What each role may do, in words for tooltips and the members list. */
export const roleRights: Record<RoomRole, string> = {
  owner: 'all rights',
  editor: 'edits the frame, snapshots and pins',
  reviewer: 'adds pins only',
  viewer: 'reads only',
}

/** Owners and editors may change a room's name and description (same rule as PATCH /api/rooms/:id). */
export const canRename = (role: RoomRole): boolean => role === 'owner' || role === 'editor'

/** Only owners may delete a room (same rule as DELETE /api/rooms/:id). */
export const canDelete = (role: RoomRole): boolean => role === 'owner'

/** Owners and editors change the frame; reviewers and viewers watch it settle. */
export const canEditFrame = (role: RoomRole): boolean => role === 'owner' || role === 'editor'
