import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import Head from 'expo-router/head';
import { useLayout } from '../hooks/useLayout';
import { colors, contentMaxWidth, readingMaxWidth, space } from '../lib/theme';
import { AppText } from './AppText';

interface ScreenProps {
  title: string;
  subtitle?: string;
  /** Shown beside the title (beneath it when there is no room). */
  actions?: ReactNode;
  /** Shown above the title, e.g. the Kernwright mark on the phone's home screen. */
  eyebrow?: ReactNode;
  /** `reading` keeps lines short for text-heavy screens; `content` suits tables. */
  width?: 'reading' | 'content';
  children: ReactNode;
}

/** A page of the signed-in area: its title bar and scrolling content, centred on a wide screen. */
export function Screen({ title, subtitle, actions, eyebrow, width = 'content', children }: ScreenProps) {
  const layout = useLayout();
  const maxWidth = width === 'reading' ? readingMaxWidth : contentMaxWidth;
  return (
    <ScrollView
      style={styles.scroll}
      contentContainerStyle={[styles.content, layout === 'wide' ? styles.contentWide : styles.contentPhone]}
      keyboardShouldPersistTaps="handled"
    >
      <Head>
        <title>{`${title} · Kernwright`}</title>
      </Head>
      <View role="main" style={[styles.column, { maxWidth }]}>
        {eyebrow}
        <View style={styles.header}>
          <View style={styles.titles}>
            <AppText variant={layout === 'wide' ? 'display' : 'title'}>{title}</AppText>
            {subtitle ? <AppText tone="muted">{subtitle}</AppText> : null}
          </View>
          {actions ? <View style={styles.actions}>{actions}</View> : null}
        </View>
        {children}
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  scroll: { flex: 1, backgroundColor: colors.paper },
  content: { flexGrow: 1, alignItems: 'center' },
  contentPhone: { padding: space.lg, paddingBottom: space.xxl },
  contentWide: { paddingHorizontal: space.xxl, paddingVertical: space.xl },
  column: { width: '100%', gap: space.lg },
  header: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-start', justifyContent: 'space-between', gap: space.md },
  titles: { flexGrow: 1, flexShrink: 1, flexBasis: 240, gap: space.xs },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
});
