// Vuetify with SVG icons bundled from @mdi/js (nothing fetched at run time) and Cutline's theme.
import 'vuetify/styles';
import { createVuetify } from 'vuetify';
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg';

export const vuetify = createVuetify({
  icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
  theme: {
    defaultTheme: 'cutline',
    themes: {
      cutline: {
        dark: false,
        colors: {
          primary: '#1d3b53',
          secondary: '#4f6d7a',
          accent: '#e8743b',
          error: '#b3261e',
          warning: '#b26a00',
          success: '#2e7d4f',
          background: '#f4f6f8',
          surface: '#ffffff',
        },
      },
    },
  },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VTextarea: { variant: 'outlined', density: 'comfortable' },
  },
});
