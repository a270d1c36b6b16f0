// Keeps a bar or a column in sight while the screen scrolls past it, where the platform can: CSS
// `position: sticky` on the web; on a phone app the part scrolls with the rest.
import { Platform, type ViewStyle } from 'react-native';

/** Style that holds a view `top` px below the top of its scrolling screen (web only; nothing elsewhere). */
export function stickyStyle(top: number): ViewStyle {
  if (Platform.OS !== 'web') return {};
  // React Native's types know no 'sticky'; react-native-web passes it to the page's CSS.
  return { position: 'sticky' as ViewStyle['position'], top, zIndex: 2 };
}

/**
 * A column held `top` px below the top of its scrolling screen and no taller than the window below
 * that (less `bottom`), so that all of it can be reached by scrolling inside it (web only).
 */
export function stickyColumnStyle(top: number, windowHeight: number, bottom: number): ViewStyle {
  if (Platform.OS !== 'web') return {};
  return { ...stickyStyle(top), maxHeight: Math.max(240, windowHeight - top - bottom) };
}
