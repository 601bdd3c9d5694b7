import { h } from 'vue'
import { NButton, NSpace, NTag, NTooltip, type DataTableColumns } from 'naive-ui'
import { RouterLink } from 'vue-router'
import type { RoomSummary } from '../api/http'
import { formatLastChange, formatTimestamp } from '../lib/format'
import { can, roleLabels, roleRights } from '../../shared/protocol'

export interface RoomRowActions {
  rename: (room: RoomSummary) => void
  remove: (room: RoomSummary) => void
}

const roleTagType = { owner: 'primary', editor: 'info', reviewer: 'warning', viewer: 'default' } as const

/** Columns of the rooms table: name, my role, members, last change, and the actions my role allows. */
export function useRoomsTable(actions: RoomRowActions): DataTableColumns<RoomSummary> {
  return [
    {
      title: 'Room',
      key: 'name',
      sorter: (a, b) => a.name.localeCompare(b.name),
      render: (room) =>
        h('div', { class: 'room-cell' }, [
          h(RouterLink, { to: { name: 'room', params: { id: room.id } }, class: 'room-link' }, () => room.name),
          room.description ? h('div', { class: 'room-description' }, room.description) : null,
        ]),
    },
    {
      title: 'My role',
      key: 'role',
      width: 130,
      render: (room) =>
        h(NTooltip, null, {
          trigger: () => h(NTag, { size: 'small', bordered: false, type: roleTagType[room.role] }, () => roleLabels[room.role]),
          default: () => roleRights[room.role],
        }),
    },
    { title: 'Members', key: 'memberCount', width: 110, align: 'right', sorter: (a, b) => a.memberCount - b.memberCount },
    {
      title: 'Last change',
      key: 'updatedAt',
      width: 160,
      defaultSortOrder: 'descend',
      sorter: (a, b) => Date.parse(a.updatedAt) - Date.parse(b.updatedAt),
      render: (room) => h('span', { title: formatTimestamp(room.updatedAt) }, formatLastChange(room.updatedAt)),
    },
    {
      title: '',
      key: 'actions',
      width: 170,
      render: (room) =>
        h(NSpace, { size: 'small', justify: 'end', wrapItem: false }, () => [
          can(room.role, 'rename')
            ? h(NButton, { size: 'small', secondary: true, onClick: () => actions.rename(room) }, () => 'Rename')
            : null,
          can(room.role, 'deleteRoom')
            ? h(NButton, { size: 'small', tertiary: true, type: 'error', onClick: () => actions.remove(room) }, () => 'Delete')
            : null,
        ]),
    },
  ]
}
