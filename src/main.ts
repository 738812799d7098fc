import '@fontsource/lato/400.css'
import '@fontsource/lato/700.css'
import { createPinia } from 'pinia'
import { createApp } from 'vue'
import App from './App.vue'
import { vScrollRegion } from './directives/scrollRegion'
import { initialThemeName } from './composables/useThemePreference'
import { vuetify } from './plugins/vuetify'
import { router } from './router'
import './styles/app.css'

vuetify.theme.change(initialThemeName())

createApp(App).directive('scroll-region', vScrollRegion).use(createPinia()).use(vuetify).use(router).mount('#app')
