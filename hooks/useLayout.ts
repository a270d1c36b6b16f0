// The one place where screen width decides the layout: bottom tabs below 1024 px, a side rail from there up.
import { useWindowDimensions } from 'react-native';

export type LayoutKind = 'phone' | 'wide';

export const WIDE_LAYOUT_MIN_WIDTH = 1024;

export function layoutForWidth(width: number): LayoutKind {
  return width >= WIDE_LAYOUT_MIN_WIDTH ? 'wide' : 'phone';
}

export function useLayout(): LayoutKind {
  const { width } = useWindowDimensions();
  return layoutForWidth(width);
}
