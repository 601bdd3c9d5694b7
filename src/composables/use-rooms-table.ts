import { h } from 'vue'
import { NButton, NSpace, NTag, NTooltip, type DataTableColumns } from 'naive-ui'
import { RouterLink } from 'vue-router'
import type { RoomActivity } from '../api/activity'
import type { RoomSummary } from '../api/http'
import { formatLastChange, formatTimestamp } from '../lib/format'
import { can, reasonWords, roleLabels, roleRights } from '../../shared/protocol'

export interface RoomRowActions {
  rename: (room: RoomSummary) => void
  remove: (room: RoomSummary) => void
}

/** Unsettled rooms first when sorted ascending: they wait for someone. */
const stateRank = (a: RoomActivity | undefined): number => (a?.solve?.state === 'unsettled' ? 0 : a?.solve ? 1 : 2)

const lastAt = (a: RoomActivity | undefined, room: RoomSummary): number =>
  Date.parse(a?.lastChange?.at ?? room.updatedAt)

/**
 * Columns of the rooms table: the surface (picture and settle state), the room with my role, the
 * last change and who made it, open pins (mine), people here now, and the actions my role allows.
 * `activity` is read inside the renderers, so the rows follow live updates.
 */
export function useRoomsTable(
  actions: RoomRowActions,
  activity: () => Record<string, RoomActivity>,
): DataTableColumns<RoomSummary> {
  const of = (room: RoomSummary): RoomActivity | undefined => activity()[room.id]
  return [
    {
      title: 'Surface',
      key: 'surface',
      width: 112,
      sorter: (a, b) => stateRank(of(a)) - stateRank(of(b)),
      render: (room) => {
        const act = of(room)
        return h('div', { class: 'surface-cell' }, [
          act?.thumbnail
            ? h('img', {
                src: act.thumbnail,
                alt: `Settled surface of ${room.name}, seen from above`,
                class: 'thumb',
                width: 80,
                height: 60,
              })
            : h('div', { class: 'thumb thumb-empty' }, 'no surface yet'),
          act?.solve
            ? h(NTooltip, null, {
                trigger: () =>
                  h(
                    NTag,
                    {
                      size: 'small',
                      bordered: false,
                      type: act.solve!.state === 'settled' ? 'success' : 'warning',
                      'data-testid': 'room-state',
                    },
                    () => (act.solve!.state === 'settled' ? 'Settled' : 'Unsettled'),
                  ),
                default: () =>
                  act.solve!.state === 'settled'
                    ? 'The last solve settled.'
                    : `Unsettled: ${reasonWords(act.solve!.reason ?? undefined)}.`,
              })
            : null,
        ])
      },
    },
    {
      title: 'Room',
      key: 'name',
      sorter: (a, b) => a.name.localeCompare(b.name),
      render: (room) =>
        h('div', { class: 'room-cell' }, [
          h(RouterLink, { to: { name: 'room', params: { id: room.id } }, class: 'room-link' }, () => room.name),
          h('div', { class: 'room-description' }, [
            h(NTooltip, null, {
              trigger: () => h('span', roleLabels[room.role]),
              default: () => roleRights[room.role],
            }),
            ` · ${room.memberCount} ${room.memberCount === 1 ? 'member' : 'members'}`,
            of(room)?.solve?.state === 'unsettled' ? ` · ${reasonWords(of(room)!.solve!.reason ?? undefined)}` : '',
          ]),
        ]),
    },
    {
      title: 'Last change',
      key: 'lastChange',
      width: 170,
      defaultSortOrder: 'descend',
      sorter: (a, b) => lastAt(of(a), a) - lastAt(of(b), b),
      render: (room) => {
        const c = of(room)?.lastChange
        const at = c?.at ?? room.updatedAt
        return h('div', { class: 'change', 'data-testid': 'room-last-change' }, [
          c ? h('div', `${c.by ?? 'A former member'} ${c.what}`) : null,
          h('small', { title: formatTimestamp(at) }, formatLastChange(at)),
        ])
      },
    },
    {
      title: 'Open pins',
      key: 'openPins',
      width: 96,
      align: 'right',
      sorter: (a, b) =>
        (of(a)?.myOpenPins ?? 0) - (of(b)?.myOpenPins ?? 0) || (of(a)?.openPins ?? 0) - (of(b)?.openPins ?? 0),
      render: (room) => {
        const act = of(room)
        return h(
          'span',
          { 'data-testid': 'room-open-pins', title: 'Open pins (of them, pins you started or replied to)' },
          act ? `${act.openPins}${act.myOpenPins ? ` · ${act.myOpenPins} mine` : ''}` : '—',
        )
      },
    },
    {
      title: 'Here now',
      key: 'people',
      width: 80,
      align: 'right',
      sorter: (a, b) => (of(a)?.people ?? 0) - (of(b)?.people ?? 0),
      render: (room) => h('span', { 'data-testid': 'room-people' }, String(of(room)?.people ?? 0)),
    },
    {
      title: '',
      key: 'actions',
      width: 150,
      render: (room) =>
        h(NSpace, { size: 'small', justify: 'end', wrapItem: false }, () => [
          can(room.role, 'rename')
            ? h(NButton, { size: 'small', secondary: true, onClick: () => actions.rename(room) }, () => 'Rename')
            : null,
          can(room.role, 'deleteRoom')
            ? h(
                NButton,
                { size: 'small', tertiary: true, type: 'error', onClick: () => actions.remove(room) },
                () => 'Delete',
              )
            : null,
        ]),
    },
  ]
}
