import type { ThemeConfig } from 'ant-design-vue/es/config-provider/context';

/**
 * Cogbook's look: graphite ink for structure, warm paper for the work surface and one
 * copper accent for actions and focus. The hex values are mirrored as CSS variables in
 * src/styles/base.css; keep the two in step.
 */
export const palette = {
  ink900: '#171A20',
  ink800: '#1F232B',
  ink700: '#2A2F39',
  ink500: '#596070',
  ink300: '#A3A9B5',
  paper50: '#FBFAF7',
  paper100: '#F3EEE4',
  paper200: '#E5DFD2',
  copper400: '#D9733A',
  copper500: '#B4531C',
  copper600: '#8F3F12',
  /** Distinct from the copper accent so an error never reads as a primary action. */
  crimson: '#B3261E',
  moss: '#2F7D4F',
  ochre: '#9A6700',
} as const;

export const fontUi =
  "'IBM Plex Sans', system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif";
export const fontMono = "'JetBrains Mono', ui-monospace, SFMono-Regular, Menlo, Consolas, monospace";

/** Token overrides for ant-design-vue's ConfigProvider. */
export const cogbookTheme: ThemeConfig = {
  token: {
    colorPrimary: palette.copper500,
    colorInfo: palette.ink700,
    colorSuccess: palette.moss,
    colorWarning: palette.ochre,
    colorError: palette.crimson,
    colorLink: palette.copper500,
    colorLinkHover: palette.copper400,
    colorLinkActive: palette.copper600,
    colorTextBase: palette.ink900,
    colorBgLayout: palette.paper50,
    colorBorder: palette.paper200,
    colorBorderSecondary: '#EEE9DF',
    fontFamily: fontUi,
    fontSize: 14,
    borderRadius: 4,
    borderRadiusLG: 6,
    borderRadiusSM: 3,
    controlHeight: 34,
    wireframe: false,
  },
  components: {
    Table: { colorFillAlter: '#F7F4EE' },
  },
};
