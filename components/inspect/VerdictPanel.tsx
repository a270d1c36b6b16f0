import type { ReactNode } from 'react';
import { Image, StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { fonts, radius, space } from '../../lib/theme';
import type { Inspection } from '../../shared/api/inspections';
import { recordReference } from '../../shared/api/records';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { MeasurementList } from './MeasurementList';
import { qualityProblems, retakeAdvice } from './retakeAdvice';
import { VERDICT_LOOK, VerdictMark } from './VerdictMark';

const HEADLINE: Record<Inspection['verdict'], string> = {
  PASS: 'The part is within every limit.',
  FAIL: 'The part is outside a limit. Set it aside as the plant’s procedure says.',
  RETAKE: 'The photo cannot be judged. Take a new photo of the same part.',
};

/** The same verdicts as a record reads them later: what was found, not what to do now. */
const RECORDED_HEADLINE: Record<Inspection['verdict'], string> = {
  PASS: 'The part was within every limit.',
  FAIL: 'The part was outside a limit.',
  RETAKE: 'The photo could not be judged; the operator was asked for a new one.',
};

interface VerdictPanelProps {
  inspection: Inspection;
  /** Width over height of the photo, for the evidence image. */
  aspectRatio?: number;
  /** Next part, dispute...: right under the verdict, so the next part is one tap away. */
  actions?: ReactNode;
  /** Shown in the records (an auditor's later reading): no instructions for the operator. */
  recorded?: boolean;
}

/** The verdict, huge: word, shape and colour, then why (measurements, evidence or the photo's problem). */
export function VerdictPanel({ inspection, aspectRatio = 4 / 3, actions, recorded = false }: VerdictPanelProps) {
  const layout = useLayout();
  const look = VERDICT_LOOK[inspection.verdict];
  const problems = qualityProblems(inspection.quality);
  const reference = recordReference(inspection.id);
  return (
    <View style={styles.column}>
      <View
        role="status"
        aria-live="assertive"
        aria-label={`Verdict ${inspection.verdict}`}
        style={[styles.banner, { borderColor: look.colour, backgroundColor: look.tint }]}
        testID="verdict"
      >
        <VerdictMark verdict={inspection.verdict} size={layout === 'phone' ? 88 : 112} />
        <View style={styles.bannerText}>
          <AppText style={[styles.word, layout === 'phone' && styles.wordPhone, { color: look.colour }]} headingLevel={2}>
            {inspection.verdict}
          </AppText>
          <AppText variant="bodyStrong">{(recorded ? RECORDED_HEADLINE : HEADLINE)[inspection.verdict]}</AppText>
          {inspection.verdict === 'FAIL' && !recorded ? <AppText variant="bodyStrong">{`Mark the part with its record: ${reference}.`}</AppText> : null}
          <AppText variant="caption" tone="muted">
            {`Record ${reference} · ${inspection.ruleName} v${inspection.ruleVersionNumber} · ${inspection.stationName} · ${new Date(inspection.createdAt).toLocaleTimeString()}`}
          </AppText>
        </View>
      </View>
      {actions}

      {inspection.verdict === 'RETAKE' ? (
        <Card>
          <AppText variant="heading">{`What was wrong with the photo: ${inspection.cause ?? 'photo quality'}`}</AppText>
          <AppText>{retakeAdvice(inspection.cause)}</AppText>
          {problems.map((problem) => (
            <AppText key={problem} variant="caption" tone="muted">{`• ${problem}`}</AppText>
          ))}
        </Card>
      ) : (
        <Card>
          <AppText variant="heading">Measurements against limits</AppText>
          <MeasurementList measurements={inspection.measurements} />
        </Card>
      )}

      {inspection.verdict === 'FAIL' && inspection.evidenceUrl ? (
        <Card>
          <AppText variant="heading">Evidence</AppText>
          <AppText variant="caption" tone="muted">{`Where the rule found ${inspection.cause ?? 'the defect'}.`}</AppText>
          <Image
            source={{ uri: inspection.evidenceUrl }}
            style={[styles.evidence, { aspectRatio }]}
            resizeMode="contain"
            accessibilityLabel={`Evidence image of the failed part: ${inspection.cause ?? 'defect'} marked`}
          />
        </Card>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.md },
  banner: { flexDirection: 'row', alignItems: 'center', gap: space.lg, padding: space.lg, borderRadius: radius.lg, borderWidth: 3 },
  bannerText: { flexShrink: 1, gap: space.xs },
  word: { fontFamily: fonts.semiBold, fontSize: 56, lineHeight: 62, letterSpacing: 2 },
  // Beside the 88 px mark on a 390 px phone, 56 px broke RETAKE over two lines.
  wordPhone: { fontSize: 46, lineHeight: 52, letterSpacing: 1 },
  evidence: { width: '100%', borderRadius: radius.md },
});
