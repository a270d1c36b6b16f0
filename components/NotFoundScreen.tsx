import { ScrollView, StyleSheet, View } from 'react-native';
import Head from 'expo-router/head';
import { useRouter } from 'expo-router';
import { colors, space } from '../lib/theme';
import { AppText } from './AppText';
import { Button } from './Button';
import { Card } from './Card';
import { KernwrightWordmark } from './KernwrightMark';

export function NotFoundScreen() {
  const router = useRouter();
  return (
    <ScrollView style={styles.scroll} contentContainerStyle={styles.content}>
      <Head>
        <title>Page not found · Kernwright</title>
      </Head>
      <View role="main" style={styles.column}>
        <KernwrightWordmark />
        <Card style={styles.card}>
          <AppText variant="title">This page does not exist</AppText>
          <AppText>The link may be mistyped, or the page has moved. Home lists everything you can open.</AppText>
          <View style={styles.actions}>
            <Button label="Go to Home" onPress={() => router.replace('/')} />
          </View>
        </Card>
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  scroll: { flex: 1, backgroundColor: colors.paper },
  content: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg },
  column: { width: '100%', maxWidth: 520, gap: space.lg },
  card: { gap: space.md, padding: space.xl },
  actions: { flexDirection: 'row' },
});
