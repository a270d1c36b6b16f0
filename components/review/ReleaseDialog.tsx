import { useEffect, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useReleaseVersion, useTrial, type SignatureMeaningChoice } from '../../hooks/useReview';
import { ApiError } from '../../lib/api';
import { space } from '../../lib/theme';
import { SIGNATURE_MEANING_LABELS, type RuleVersion } from '../../shared/api/rules';
import { trialCautions } from '../../shared/rules/trial-cautions';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { CheckList } from '../CheckList';
import { ChoiceChips } from '../ChoiceChips';
import { Dialog } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';

interface ReleaseDialogProps {
  version: RuleVersion;
  visible: boolean;
  onClose: () => void;
  onReleased: (version: RuleVersion) => void;
}

const MEANINGS: SignatureMeaningChoice[] = ['review', 'approval', 'responsibility'];

/** Release signs the version: the password again, what the signature means, a note, then a last confirmation. */
export function ReleaseDialog({ version, visible, onClose, onReleased }: ReleaseDialogProps) {
  const release = useReleaseVersion();
  const { reset } = release;
  const [password, setPassword] = useState('');
  const [meaning, setMeaning] = useState<SignatureMeaningChoice>('approval');
  const [note, setNote] = useState('');
  const [confirming, setConfirming] = useState(false);
  const [passwordError, setPasswordError] = useState<string>();
  // The submitted trial's cautions (a wrong PASS ships a bad part): the signer ticks that they read them.
  const trial = useTrial(version.submittedTrialId);
  const cautions = trial.data?.summary ? trialCautions(trial.data.summary) : [];
  // Until the trial is read, its cautions are unknown: nothing is signed meanwhile.
  const trialUnread = Boolean(version.submittedTrialId) && !trial.data;
  const [accepted, setAccepted] = useState(false);
  const [acceptError, setAcceptError] = useState<string>();

  useEffect(() => {
    if (!visible) {
      setPassword('');
      setNote('');
      setConfirming(false);
      setPasswordError(undefined);
      setAccepted(false);
      setAcceptError(undefined);
      reset();
    }
  }, [visible, reset]);

  const sign = () =>
    release.mutate(
      { id: version.id, password, meaning, note: note.trim() },
      {
        onSuccess: onReleased,
        onError: (error) => {
          setConfirming(false);
          const issue = error instanceof ApiError ? error.fieldIssues.find((i) => i.path === 'password') : undefined;
          if (issue) setPasswordError(`${issue.message}: nothing was signed. Enter your own password.`);
        },
      },
    );

  const generalError = release.error && !(release.error instanceof ApiError && release.error.fieldIssues.some((i) => i.path === 'password')) ? release.error : null;

  return (
    <Dialog
      visible={visible}
      title={confirming ? 'Sign and release?' : `Release ${version.ruleName} v${version.number}`}
      onClose={onClose}
      actions={
        confirming ? (
          <>
            <Button label="Back" variant="secondary" onPress={() => setConfirming(false)} disabled={release.isPending} />
            <Button label="Sign and release" onPress={sign} busy={release.isPending} />
          </>
        ) : (
          <>
            <Button label="Cancel" variant="secondary" onPress={onClose} />
            <Button
              label="Continue"
              onPress={() => {
                if (cautions.length > 0 && !accepted) setAcceptError('Tick this to release the rule with these results, or close and send it back.');
                if (!password) setPasswordError('Enter your password to sign');
                if (password && !trialUnread && (cautions.length === 0 || accepted)) setConfirming(true);
              }}
            />
          </>
        )
      }
    >
      {confirming ? (
        <AppText>
          {`You sign “${SIGNATURE_MEANING_LABELS[meaning]}” for ${version.ruleName} v${version.number}, bound to its content. The version reaches the line at once, replaces the released one, and can no longer change.${cautions.length > 0 ? ` You release it knowing: ${cautions.join(' ')}` : ''}`}
        </AppText>
      ) : (
        <View style={styles.form}>
          <AppText>Your signature records your name, the date and time, and what it means. It stays bound to this exact content.</AppText>
          {trialUnread ? (
            <AppText tone="caution" role="status">{trial.isError ? '⚠ The submitted trial could not be read: reload the page before signing.' : 'Reading the submitted trial’s figures…'}</AppText>
          ) : null}
          {cautions.map((caution) => (
            <AppText key={caution} tone="danger" variant="bodyStrong">{`⚠ ${caution}`}</AppText>
          ))}
          {cautions.length > 0 ? (
            <CheckList
              label="Before you sign"
              items={[{ value: 'accepted', label: 'I have read these trial results', detail: 'Releasing the rule with them is my decision under the plant’s quality procedures.' }]}
              value={accepted ? ['accepted'] : []}
              onChange={(ticked) => {
                setAccepted(ticked.length > 0);
                setAcceptError(undefined);
              }}
              error={acceptError}
            />
          ) : null}
          <ChoiceChips<SignatureMeaningChoice>
            label="Meaning of your signature"
            choices={MEANINGS.map((m) => ({ value: m, label: SIGNATURE_MEANING_LABELS[m] }))}
            value={meaning}
            onChange={setMeaning}
          />
          <TextField
            label="Your password"
            value={password}
            onChangeText={(text) => {
              setPassword(text);
              setPasswordError(undefined);
            }}
            secureTextEntry
            autoComplete="current-password"
            error={passwordError}
          />
          <TextField label="Note (optional)" value={note} onChangeText={setNote} multiline numberOfLines={2} maxLength={2000} />
        </View>
      )}
      {generalError ? <ErrorBanner error={generalError} /> : null}
    </Dialog>
  );
}

const styles = StyleSheet.create({
  form: { gap: space.lg },
});
