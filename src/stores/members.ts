import { ref } from 'vue'
import { defineStore } from 'pinia'
import { listMembers, type Member, type RoomRole } from '../api/http'
import * as team from '../api/team'
import type { PendingInvite } from '../api/team'

export const useMembersStore = defineStore('members', () => {
  const roomId = ref<string | null>(null)
  const members = ref<Member[]>([])
  const invites = ref<PendingInvite[]>([])
  const loading = ref(false)

  /** Loads members, and the pending invites when I am an owner (others may not see them). */
  async function load(id: string, myRole: RoomRole): Promise<void> {
    if (roomId.value !== id) {
      members.value = []
      invites.value = []
    }
    roomId.value = id
    loading.value = true
    try {
      const [m, i] = await Promise.all([
        listMembers(id),
        myRole === 'owner' ? team.listInvites(id) : Promise.resolve([]),
      ])
      if (roomId.value !== id) return
      members.value = m
      invites.value = i
    } finally {
      loading.value = false
    }
  }

  function room(): string {
    if (!roomId.value) throw new Error('members store: load(roomId) first')
    return roomId.value
  }

  /** Sends an invite e-mail and lists the invite as pending. */
  async function invite(email: string, role: RoomRole): Promise<PendingInvite> {
    const created = await team.createInvite(room(), { email: email.trim(), role })
    invites.value = [created, ...invites.value.filter((i) => i.id !== created.id)]
    return created
  }

  /** Withdraws a pending invite; its link then answers "revoked". */
  async function revoke(inviteId: string): Promise<void> {
    await team.revokeInvite(room(), inviteId)
    invites.value = invites.value.filter((i) => i.id !== inviteId)
  }

  /** Changes a member's role (owner); the server refuses to demote the last owner. */
  async function changeRole(userId: string, role: RoomRole): Promise<void> {
    const changed = await team.changeMemberRole(room(), userId, role)
    members.value = members.value.map((m) => (m.userId === userId ? { ...m, role: changed.role } : m))
  }

  /** Removes a member (owner), or me leaving the room. */
  async function remove(userId: string): Promise<void> {
    await team.removeMember(room(), userId)
    members.value = members.value.filter((m) => m.userId !== userId)
  }

  return { roomId, members, invites, loading, load, invite, revoke, changeRole, remove }
})
