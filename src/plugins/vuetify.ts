// Vuetify with SVG icons bundled from @mdi/js (nothing fetched at run time) and Cutline's theme.
import 'vuetify/styles';
import { createVuetify } from 'vuetify';
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg';
import { vuetifyThemeColours } from './theme-colours';

export const vuetify = createVuetify({
  icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
  theme: {
    defaultTheme: 'cutline',
    themes: {
      cutline: {
        dark: false,
        colors: vuetifyThemeColours,
      },
    },
  },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VTextarea: { variant: 'outlined', density: 'comfortable' },
  },
});
