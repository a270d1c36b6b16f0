// The rules list's filters in words, for the line they fold into on a phone.
import type { RuleVersionState } from '../../shared/api/rules';

export interface RuleFilterChoice {
  mine: boolean;
  state: RuleVersionState | null;
  partType: string | null;
}

/** "Everyone’s rules · latest version in review · Stamped bracket 60×30". */
export function describeRuleFilters(choice: RuleFilterChoice, stateWord: (state: RuleVersionState) => string, partTypeName: (code: string) => string): string {
  return [
    choice.mine ? 'Rules I created or edited' : 'Everyone’s rules',
    choice.state ? `latest version ${stateWord(choice.state).toLowerCase()}` : 'latest version in any state',
    choice.partType ? partTypeName(choice.partType) : 'every part type',
  ].join(' · ');
}
