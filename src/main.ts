import { createApp } from 'vue'
import { createPinia } from 'pinia'
import '@fontsource/work-sans/400.css'
import '@fontsource/work-sans/500.css'
import '@fontsource/work-sans/600.css'
import './styles.css'
import App from './App.vue'
import { setSignedOutHandler } from './api/http'
import { router } from './router'
import { useSessionStore } from './stores/session'

const app = createApp(App)
const pinia = createPinia()
app.use(pinia)
app.use(router)

// A session that ended elsewhere (expiry, another tab) sends us to sign-in with the way back.
setSignedOutHandler(() => {
  const session = useSessionStore(pinia)
  if (!session.user) return
  session.user = null
  const here = router.currentRoute.value
  if (!here.meta.public) void router.replace({ name: 'sign-in', query: { redirect: here.fullPath } })
})

app.mount('#app')
