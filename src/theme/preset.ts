import { definePreset } from '@primeuix/themes';
import Aura from '@primeuix/themes/aura';

/**
 * Titrata's own preset: estuary teal primary on limestone surfaces with slate text
 * (product.md, look and feel). Status colours are defined in styles.css and used only
 * for status.
 */
export const TitrataPreset = definePreset(Aura, {
  primitive: {
    borderRadius: { none: '0', xs: '2px', sm: '4px', md: '6px', lg: '8px', xl: '12px' },
  },
  semantic: {
    primary: {
      50: '#eaf4f5',
      100: '#cbe3e6',
      200: '#9fcad0',
      300: '#6aaab3',
      400: '#3b8893',
      500: '#12606B',
      600: '#0f535d',
      700: '#0c454e',
      800: '#0a383f',
      900: '#072a30',
      950: '#041b1f',
    },
    colorScheme: {
      light: {
        surface: {
          0: '#ffffff',
          50: '#faf8f3',
          100: '#EFE9DD',
          200: '#e2dacb',
          300: '#cfc5b2',
          400: '#a89f8d',
          500: '#7d7668',
          600: '#5b5a55',
          700: '#475060',
          800: '#334155',
          900: '#1f2937',
          950: '#111827',
        },
        text: { color: '#334155', mutedColor: '#5b6577' },
      },
    },
    focusRing: { width: '2px', style: 'solid', color: '{primary.500}', offset: '2px' },
  },
});
