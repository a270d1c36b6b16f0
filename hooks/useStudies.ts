// Agreement studies (measurement system analysis): repeatability of a rule on one part, and
// attribute agreement of its verdicts with a qualified person's judgement, through react-query.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AttributeAgreementQuery, CreateRepeatabilityStudy } from '../shared/api/studies';
import {
  createRepeatabilityStudy,
  fetchAttributeAgreement,
  listRepeatabilityStudies,
  listRules,
  type UploadablePhoto,
} from '../lib/api';

export const studyKeys = {
  all: ['studies'] as const,
  repeatabilityList: () => [...studyKeys.all, 'repeatability', 'list'] as const,
  attributeAgreement: (query: AttributeAgreementQuery) => [...studyKeys.all, 'attribute-agreement', query] as const,
  releasedRules: () => [...studyKeys.all, 'released-rules'] as const,
};

export function useRepeatabilityStudies() {
  return useQuery({ queryKey: studyKeys.repeatabilityList(), queryFn: ({ signal }) => listRepeatabilityStudies(signal) });
}

export interface NewRepeatabilityStudy {
  fields: CreateRepeatabilityStudy;
  photos: UploadablePhoto[];
  onProgress?: (sent: number) => void;
}

export function useCreateRepeatabilityStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ fields, photos, onProgress }: NewRepeatabilityStudy) => createRepeatabilityStudy(fields, photos, onProgress),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: studyKeys.repeatabilityList() }),
  });
}

/** Computed when asked: null until a source is chosen. */
export function useAttributeAgreement(query: AttributeAgreementQuery | null) {
  return useQuery({
    queryKey: studyKeys.attributeAgreement(query ?? { source: 'trial', trialId: '' }),
    queryFn: ({ signal }) => fetchAttributeAgreement(query!, signal),
    enabled: query !== null,
  });
}

/** Rules with a released version: a repeatability study runs the version the line uses. */
export function useReleasedRules() {
  return useQuery({
    queryKey: studyKeys.releasedRules(),
    queryFn: async ({ signal }) => {
      const { items } = await listRules({ state: 'released', limit: 200, offset: 0 }, signal);
      return items.filter((rule) => rule.releasedVersion !== null);
    },
  });
}
