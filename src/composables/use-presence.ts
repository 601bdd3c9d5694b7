/**
 * Presence for components: who else is in the room and which frame point each holds. The awareness
 * tracking itself is in api/collaboration.ts (trackPeers), feeding the workbench store.
 */
import { computed } from 'vue'
import type { Peer } from '../api/collaboration'
import { useWorkbenchStore } from '../stores/workbench'

/** Peers and, per held point ("loopId/pointId"), the peer holding it. */
export function usePresence() {
  const store = useWorkbenchStore()
  const heldBy = computed(() => {
    const map = new Map<string, Peer>()
    for (const peer of store.peers) if (peer.held) map.set(`${peer.held.loopId}/${peer.held.pointId}`, peer)
    return map
  })
  return { peers: computed(() => store.peers), heldBy }
}
