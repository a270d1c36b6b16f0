import { useState } from 'react';
import { Platform, View } from 'react-native';
import { Slot } from 'expo-router';
import { useFonts } from 'expo-font';
import { QueryClientProvider } from '@tanstack/react-query';
import { IBMPlexSans_400Regular } from '@expo-google-fonts/ibm-plex-sans/400Regular';
import { IBMPlexSans_500Medium } from '@expo-google-fonts/ibm-plex-sans/500Medium';
import { IBMPlexSans_600SemiBold } from '@expo-google-fonts/ibm-plex-sans/600SemiBold';
import { SessionProvider } from '../hooks/useSession';
import { installHistoryGuard } from '../lib/historyGuard';
import { createQueryClient } from '../lib/queryClient';
import { colors } from '../lib/theme';

// Before the router adds its own listener (lib/historyGuard.ts).
if (Platform.OS === 'web') installHistoryGuard();

export default function RootLayout() {
  const [queryClient] = useState(createQueryClient);
  // A font that fails to load falls back to the system face rather than blocking the app.
  const [fontsLoaded, fontError] = useFonts({ IBMPlexSans_400Regular, IBMPlexSans_500Medium, IBMPlexSans_600SemiBold });
  if (!fontsLoaded && !fontError) return <View style={{ flex: 1, backgroundColor: colors.paper }} />;
  return (
    <QueryClientProvider client={queryClient}>
      <SessionProvider>
        <Slot />
      </SessionProvider>
    </QueryClientProvider>
  );
}
