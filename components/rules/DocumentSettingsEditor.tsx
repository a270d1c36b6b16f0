// The rule document's own settings: its name, which channel of the photo the pipeline reads, and
// how neighbourhood steps treat pixels beyond the image's edge.
import { View, StyleSheet } from 'react-native';
import { BORDER_MODES, INPUT_CHANNELS } from '../../shared/rules/schema';
import { BORDER_LABELS, CHANNEL_LABELS } from '../../shared/rules/words';
import type { FieldIssue } from '../../shared/api/errors';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { TextField } from '../TextField';
import type { EditorAction, EditorState } from './ruleEditorState';

interface DocumentSettingsEditorProps {
  state: Pick<EditorState, 'name' | 'input' | 'border'>;
  issues: readonly FieldIssue[];
  dispatch: (action: EditorAction) => void;
}

export function DocumentSettingsEditor({ state, issues, dispatch }: DocumentSettingsEditorProps) {
  const nameIssue = issues.find((i) => i.path === 'name');
  return (
    <View style={styles.group}>
      <TextField
        label="Name in the rule document"
        value={state.name}
        onChangeText={(name) => dispatch({ type: 'set-settings', settings: { name } })}
        error={nameIssue?.message}
        hint="Printed on reports with the version; the rule's own name in the list does not change."
      />
      <ChoiceChips
        label="Photo channel the pipeline reads"
        choices={INPUT_CHANNELS.map((c) => ({ value: c, label: CHANNEL_LABELS[c] }))}
        value={state.input.channel}
        onChange={(channel) => dispatch({ type: 'set-settings', settings: { channel } })}
      />
      <ChoiceChips
        label="Beyond the image's edge"
        choices={BORDER_MODES.map((b) => ({ value: b, label: BORDER_LABELS[b].label }))}
        value={state.border}
        onChange={(border) => dispatch({ type: 'set-settings', settings: { border } })}
      />
      <AppText variant="caption" tone="muted">{BORDER_LABELS[state.border].meaning}</AppText>
    </View>
  );
}

const styles = StyleSheet.create({ group: { gap: space.md } });
