import { Text, type TextProps } from 'react-native';
import { colors, type as typeScale, type TypeVariant } from '../lib/theme';

const TONES = {
  default: colors.ink,
  muted: colors.inkMuted,
  danger: colors.danger,
  notice: colors.notice,
  caution: colors.caution,
  steel: colors.steel,
  onSteel: colors.onSteel,
} as const;
export type TextTone = keyof typeof TONES;

const HEADING_LEVELS: Partial<Record<TypeVariant, number>> = { display: 1, title: 1, heading: 2 };

interface AppTextProps extends TextProps {
  variant?: TypeVariant;
  tone?: TextTone;
  /** Heading level for assistive technology; display, title and heading variants are headings unless null. */
  headingLevel?: number | null;
}

/** All text in Kernwright: the shipped font, the type scale and a tone from the palette. */
export function AppText({ variant = 'body', tone = 'default', headingLevel, style, ...rest }: AppTextProps) {
  const level = headingLevel === undefined ? HEADING_LEVELS[variant] : headingLevel;
  return (
    <Text
      {...(level ? { role: 'heading' as const, 'aria-level': level } : null)}
      style={[typeScale[variant], { color: TONES[tone] }, style]}
      {...rest}
    />
  );
}
