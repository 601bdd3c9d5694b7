import { onBeforeUnmount, watchEffect } from 'vue'
import { pageStyle } from '../lib/report/page-style'

/** Puts the report's @page style sheet in the document while the view is mounted (print only). */
export function usePageStyle(text: () => { header: string; date: string; caution: string } | null): void {
  const el = document.createElement('style')
  el.media = 'print'
  el.dataset.reportPage = ''
  document.head.append(el)
  watchEffect(() => {
    const t = text()
    el.textContent = t ? pageStyle(t) : ''
  })
  onBeforeUnmount(() => el.remove())
}
