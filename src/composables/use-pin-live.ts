/**
 * Keeps the pins store live: loads a room's pins and follows `pin:changed` / `pin:deleted` on the
 * room's socket (the workbench's surface-stream socket, which has joined the room; one connection
 * per page). Pins are reloaded whenever that socket (re)connects, since missed events are not
 * replayed.
 */
import { watch, type Ref } from 'vue'
import { usePinsStore, type PinEventSource } from '../stores/pins'

export function usePinLive(roomId: Ref<string>, source: Ref<PinEventSource | null>) {
  const store = usePinsStore()
  watch(
    [roomId, source],
    ([id, src], _old, onCleanup) => {
      const reload = (): void => void store.load(id).catch(() => undefined)
      reload()
      if (!src) return
      const unlisten = store.listen(src)
      src.on('connect', reload)
      onCleanup(() => {
        unlisten()
        src.off('connect', reload)
      })
    },
    { immediate: true },
  )
}
