// Every app-wide plugin is registered here, once.
import type { App } from 'vue';
import { createPinia } from 'pinia';
import '@fontsource/roboto/300.css';
import '@fontsource/roboto/400.css';
import '@fontsource/roboto/500.css';
import '@fontsource/roboto/700.css';
import '../styles/app.css';
import { vuetify } from './vuetify';
import { router } from '../router';
import { registerCharts } from './chart';

export function registerPlugins(app: App) {
  app.use(createPinia());
  app.use(vuetify);
  app.use(router);
  registerCharts();
}
