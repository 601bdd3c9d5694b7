/**
 * Keeps the pins store live: loads a room's pins and follows `pin:changed` / `pin:deleted`. With
 * no event source given it opens its own socket.io connection and joins the room (the server sends
 * pin events to room members who joined); pass the workbench's socket to share one connection.
 */
import { onBeforeUnmount, watch, type Ref } from 'vue'
import { io, type Socket } from 'socket.io-client'
import { usePinsStore, type PinEventSource } from '../stores/pins'

export function usePinLive(roomId: Ref<string>, source?: PinEventSource) {
  const store = usePinsStore()
  let socket: Socket | null = null
  let unlisten = (): void => {}

  function close(): void {
    unlisten()
    socket?.removeAllListeners()
    socket?.disconnect()
    socket = null
  }

  watch(roomId, (id) => {
    close()
    void store.load(id).catch(() => undefined)
    if (source) {
      unlisten = store.listen(source)
      return
    }
    const s = io({ withCredentials: true })
    socket = s
    let first = true
    s.on('connect', () => {
      s.emit('room:join', { roomId: id })
      // Events missed while disconnected are not replayed: reload on every reconnect.
      if (!first) void store.load(id).catch(() => undefined)
      first = false
    })
    unlisten = store.listen(s)
  }, { immediate: true })

  onBeforeUnmount(close)
}
