import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { ROLE_LABELS } from '../shared/roles';
import { useSession } from '../hooks/useSession';
import { canUseArea, findArea, type AreaKey } from '../lib/navigation';
import { space } from '../lib/theme';
import { AppText } from './AppText';
import { Button } from './Button';
import { Card } from './Card';
import { Screen } from './Screen';

/** Shows the area only to people whose roles include it; everyone else learns why, instead of a crash. */
export function AreaGate({ area, children }: { area: AreaKey; children: ReactNode }) {
  const { user } = useSession();
  const router = useRouter();
  if (user && canUseArea(user.roles, area)) return <>{children}</>;
  const { title } = findArea(area);
  const roles = user?.roles.map((role) => ROLE_LABELS[role]).join(', ') || 'none';
  return (
    <Screen title={title} width="reading">
      <Card style={styles.card}>
        <AppText variant="heading">{`The ${title} area is not available for your roles`}</AppText>
        <AppText>{`Your roles: ${roles}. If your work needs this area, ask an administrator to add the role that uses it.`}</AppText>
        <View style={styles.actions}>
          <Button label="Go to Home" onPress={() => router.replace('/')} />
        </View>
      </Card>
    </Screen>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  actions: { flexDirection: 'row' },
});
