// The home screen's body: for each role the person holds, what they can do next and where.
import { Pressable, StyleSheet, View } from 'react-native';
import { Link } from 'expo-router';
import type { User } from '../shared/api/auth';
import { ROLE_LABELS, type Role } from '../shared/roles';
import { findArea, NEXT_STEPS, type NextStep } from '../lib/navigation';
import { calloutStyle, colors, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';
import { Card } from './Card';

const ROLE_INTRO: Record<Role, string> = {
  engineer: 'You turn what a bad part looks like into inspection rules and prove them on reference sets.',
  operator: 'You inspect parts at your station with released rules.',
  supervisor: 'You release rules, look after the stations and watch how the line is doing.',
  auditor: 'You read and export the records; nothing you do here changes them.',
  admin: 'You look after the people who use Kernwright and their roles.',
};

/** "As a supervisor", "As an auditor". */
function asRole(role: Role): string {
  const label = ROLE_LABELS[role].toLowerCase();
  return `As ${/^[aeiou]/.test(label) ? 'an' : 'a'} ${label}`;
}

function StepLink({ step }: { step: NextStep }) {
  const area = findArea(step.area);
  return (
    <Link href={area.href} asChild>
      <Pressable
        accessibilityRole="link"
        accessibilityLabel={`${step.text} Open ${area.title}.`}
        style={styles.step}
      >
        <AppText style={styles.stepText}>{step.text}</AppText>
        <AppText variant="label" tone="steel" style={styles.stepArea}>
          {`${area.title} ›`}
        </AppText>
      </Pressable>
    </Link>
  );
}

export function HomeOverview({ user }: { user: User }) {
  return (
    <View style={styles.sections}>
      {user.roles.map((role) => (
        <Card key={role} style={styles.card}>
          <AppText variant="heading">{asRole(role)}</AppText>
          <AppText tone="muted">{ROLE_INTRO[role]}</AppText>
          <View style={styles.steps}>
            {NEXT_STEPS[role].map((step) => (
              <StepLink key={step.text} step={step} />
            ))}
          </View>
          {role === 'operator' ? (
            <View style={styles.note} accessibilityRole="text">
              <AppText variant="label" tone="caution">
                Good to know
              </AppText>
              <AppText>
                A verdict is a decision aid, checked on the rule’s reference set. If a part looks wrong whatever the verdict,
                set it aside and flag it: a qualified person decides.
              </AppText>
            </View>
          ) : null}
        </Card>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  sections: { gap: space.lg },
  card: { gap: space.md },
  steps: { gap: space.xs },
  step: {
    minHeight: minTouchTarget,
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    justifyContent: 'space-between',
    columnGap: space.md,
    rowGap: space.xxs,
    paddingVertical: space.sm,
    paddingHorizontal: space.md,
    borderRadius: radius.md,
    backgroundColor: colors.paper,
  },
  stepText: { flexGrow: 1, flexShrink: 1, flexBasis: 220 },
  stepArea: { flexShrink: 0 },
  note: {
    gap: space.xxs,
    ...calloutStyle('caution'),
  },
});
