export * from './user.js'
export * from './room.js'
export * from './invite.js'
export * from './room-document.js'
export * from './snapshot.js'
export * from './pin.js'

import { UserEntity } from './user.js'
import { RoomEntity, MembershipEntity } from './room.js'
import { InviteEntity } from './invite.js'
import { RoomDocumentEntity } from './room-document.js'
import { SnapshotEntity } from './snapshot.js'
import { PinEntity, PinReplyEntity } from './pin.js'

export const entities = [
  UserEntity,
  RoomEntity,
  MembershipEntity,
  InviteEntity,
  RoomDocumentEntity,
  SnapshotEntity,
  PinEntity,
  PinReplyEntity,
]
