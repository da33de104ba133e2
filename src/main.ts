// Installs the app-wide plugins. ECharts is registered by the chart component itself (src/plugins/echarts.ts),
// so its code loads with the star page, not with sign-in.
import { createApp } from 'vue'
import { createPinia } from 'pinia'
import App from './App.vue'
import router from './router/index.ts'
import vuetify from './plugins/vuetify.ts'

createApp(App).use(createPinia()).use(router).use(vuetify).mount('#app')
