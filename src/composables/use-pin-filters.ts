import { computed, ref, type Ref } from 'vue'
import type { Pin } from '../api/team'
import type { RoomRole } from '../api/http'

/** What the pins panel shows: by state, and optionally only pins I wrote. */
export interface PinFilter {
  status: 'open' | 'resolved' | 'all'
  mine: boolean
}

/**
 * Pins matching the filter, newest activity first (a fresh reply brings a thread back to the top).
 * `myUserId` undefined (signed out) makes "mine" match nothing rather than everything.
 */
export function filterPins(pins: readonly Pin[], filter: PinFilter, myUserId: string | undefined): Pin[] {
  return pins
    .filter((p) => filter.status === 'all' || p.resolved === (filter.status === 'resolved'))
    .filter((p) => !filter.mine || (myUserId !== undefined && p.author?.id === myUserId))
    .sort((a, b) => Date.parse(b.updatedAt) - Date.parse(a.updatedAt) || a.id.localeCompare(b.id))
}

/** Counts for the filter buttons. */
export function pinCounts(
  pins: readonly Pin[],
  myUserId: string | undefined,
): { open: number; resolved: number; mine: number } {
  let open = 0
  let mine = 0
  for (const p of pins) {
    if (!p.resolved) open++
    if (myUserId !== undefined && p.author?.id === myUserId) mine++
  }
  return { open, resolved: pins.length - open, mine }
}

/**
 * Merges a pin from a reply or a `pin:changed` event. An older copy never overwrites a newer one:
 * socket events and HTTP replies for the same change can arrive in either order.
 */
export function upsertPin(pins: readonly Pin[], pin: Pin): Pin[] {
  const i = pins.findIndex((p) => p.id === pin.id)
  if (i < 0) return [...pins, pin]
  const old = pins[i]!
  if (Date.parse(old.updatedAt) > Date.parse(pin.updatedAt)) return [...pins]
  const next = [...pins]
  next[i] = pin
  return next
}

/** Editors and owners resolve and reopen (the server's rule; reviewers only comment). */
export const canResolvePins = (role: RoomRole): boolean => role === 'owner' || role === 'editor'
/** Reviewers and up add pins and replies; viewers read. */
export const canAddPins = (role: RoomRole): boolean => role !== 'viewer'
/** Only a pin's author may change its text or delete it. */
export const isPinAuthor = (pin: Pin, myUserId: string | undefined): boolean =>
  myUserId !== undefined && pin.author?.id === myUserId

/** Filter state and the filtered list for a panel. */
export function usePinFilters(pins: Ref<readonly Pin[]>, myUserId: Ref<string | undefined>) {
  const filter = ref<PinFilter>({ status: 'open', mine: false })
  const shown = computed(() => filterPins(pins.value, filter.value, myUserId.value))
  const counts = computed(() => pinCounts(pins.value, myUserId.value))
  return { filter, shown, counts }
}
