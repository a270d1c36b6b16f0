// Kernwright's own look: a calm ink-and-steel palette on warm paper, one type family (IBM Plex Sans).
// Contrast ratios in the comments follow WCAG 2.2 (text >= 4.5:1, controls and borders >= 3:1),
// computed against `paper` and `surface`.

export const colors = {
  paper: '#F4F2EE', // page background (also app.json's web backgroundColor)
  surface: '#FFFFFF', // cards, tables, dialogs
  surfaceSunken: '#ECE9E3', // table header, filter band
  surfaceMuted: '#F8F7F4', // rows of deactivated records
  ink: '#1B2733', // main text: 13.6:1 on paper
  inkMuted: '#4B5A66', // secondary text: 6.4:1 on paper
  steel: '#1F3A4D', // primary actions, navigation: 10.6:1 on paper (app.json's themeColor)
  steelPressed: '#152A39',
  steelTint: '#DCE4EA', // selected navigation item and chips
  steelMid: '#5C7485', // the outer cells of the Kernwright mark
  onSteel: '#FFFFFF', // 11.9:1 on steel
  line: '#D9DDE0', // decorative dividers only
  control: '#8A96A0', // input and chip borders: 3.0:1 on surface
  focus: '#2F6583', // keyboard focus ring: 5.7:1 on paper
  danger: '#A2382C', // errors and destructive actions: 6.0:1 on paper
  dangerPressed: '#84291F',
  dangerTint: '#F6E3DF',
  notice: '#2C6A4E', // confirmations: 5.7:1 on paper
  noticeTint: '#E0EEE6',
  caution: '#7A5410', // warnings: 6.1:1 on paper
  cautionTint: '#F5EBD6',
  backdrop: 'rgba(27, 39, 51, 0.45)', // behind dialogs
} as const;

export const space = { xxs: 2, xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32, xxxl: 48 } as const;

export const radius = { sm: 4, md: 8, lg: 12, pill: 999 } as const;

/** Font family names as registered with expo-font in app/_layout.tsx. */
export const fonts = {
  regular: 'IBMPlexSans_400Regular',
  medium: 'IBMPlexSans_500Medium',
  semiBold: 'IBMPlexSans_600SemiBold',
} as const;

/** Type scale (a 1.2 ratio rounded to whole pixels); body text stays 16 px so phone inputs do not zoom. */
export const type = {
  display: { fontFamily: fonts.semiBold, fontSize: 28, lineHeight: 34 },
  title: { fontFamily: fonts.semiBold, fontSize: 23, lineHeight: 30 },
  heading: { fontFamily: fonts.semiBold, fontSize: 19, lineHeight: 26 },
  body: { fontFamily: fonts.regular, fontSize: 16, lineHeight: 24 },
  bodyStrong: { fontFamily: fonts.medium, fontSize: 16, lineHeight: 24 },
  label: { fontFamily: fonts.medium, fontSize: 14, lineHeight: 20 },
  caption: { fontFamily: fonts.regular, fontSize: 13, lineHeight: 18 },
} as const;
export type TypeVariant = keyof typeof type;

/** WCAG 2.2 target size (enhanced, 2.5.5) asks 44 x 44 CSS px for touch targets. */
export const minTouchTarget = 44;

/** Readable line length for text-heavy screens on a wide display. */
export const contentMaxWidth = 1120;
export const readingMaxWidth = 720;

export type CalloutTone = 'danger' | 'caution' | 'notice' | 'steel';

/** A boxed message with a thick left edge in its tone: an error, a caution, a confirmation or a hint. */
export function calloutStyle(tone: CalloutTone) {
  return {
    padding: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderLeftWidth: 4,
    borderColor: colors[tone],
    backgroundColor: colors[`${tone}Tint` as const],
  };
}

/** A callout laid out as a line: its text, then an action at the end (below it on a narrow screen). */
export function bannerStyle(tone: CalloutTone) {
  return { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md, ...calloutStyle(tone) } as const;
}

/** The text block of a `bannerStyle` line. */
export const bannerText = { flexGrow: 1, flexShrink: 1, flexBasis: 220, gap: space.xxs } as const;
