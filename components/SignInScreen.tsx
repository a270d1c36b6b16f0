import { ScrollView, StyleSheet, View } from 'react-native';
import Head from 'expo-router/head';
import type { SessionEndReason } from '../lib/session';
import { colors, space } from '../lib/theme';
import { AppText } from './AppText';
import { Card } from './Card';
import { KernwrightWordmark } from './KernwrightMark';
import { SignInForm } from './SignInForm';

export function SignInScreen({ endReason }: { endReason: SessionEndReason | null }) {
  return (
    <ScrollView style={styles.scroll} contentContainerStyle={styles.content} keyboardShouldPersistTaps="handled">
      <Head>
        <title>Sign in · Kernwright</title>
      </Head>
      <View role="main" style={styles.column}>
        <KernwrightWordmark />
        <View style={styles.intro}>
          <AppText variant="title">Sign in</AppText>
          <AppText tone="muted">Visual inspection of manufactured parts: rules, stations, verdicts and records.</AppText>
        </View>
        <Card style={styles.card}>
          <SignInForm endReason={endReason} />
        </Card>
        <AppText variant="caption" tone="muted">
          No account yet? Your administrator creates accounts and gives them roles.
        </AppText>
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  scroll: { flex: 1, backgroundColor: colors.paper },
  content: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg },
  column: { width: '100%', maxWidth: 420, gap: space.lg },
  intro: { gap: space.xs },
  card: { padding: space.xl },
});
