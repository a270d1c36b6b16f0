// Reference sets, their labelled photos and the plant's catalogue of part types and defect kinds, through react-query.
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ImageLabel } from '../shared/api/references';
import {
  createReferenceSet,
  getReferenceSet,
  listDefectKinds,
  listPartTypes,
  listReferenceImages,
  listReferenceSets,
  relabelReferenceImages,
  type LabelChange,
} from '../lib/api';

export interface ReferenceImageFilters {
  label: ImageLabel | null;
  defectKind: string | null;
  limit: number;
  offset: number;
}

export const referenceSetKeys = {
  all: ['reference-sets'] as const,
  lists: () => [...referenceSetKeys.all, 'list'] as const,
  detail: (id: string) => [...referenceSetKeys.all, 'detail', id] as const,
  images: (id: string) => [...referenceSetKeys.detail(id), 'images'] as const,
  imagePage: (id: string, filters: ReferenceImageFilters) => [...referenceSetKeys.images(id), filters] as const,
};

export const catalogueKeys = {
  all: ['catalogue'] as const,
  partTypes: () => [...catalogueKeys.all, 'part-types'] as const,
  defectKinds: () => [...catalogueKeys.all, 'defect-kinds'] as const,
};

export function usePartTypes() {
  return useQuery({ queryKey: catalogueKeys.partTypes(), queryFn: ({ signal }) => listPartTypes(signal), staleTime: 5 * 60_000 });
}

export function useDefectKinds() {
  return useQuery({ queryKey: catalogueKeys.defectKinds(), queryFn: ({ signal }) => listDefectKinds(signal), staleTime: 5 * 60_000 });
}

/** A part type's name as the plant's catalogue gives it; its code until the catalogue has loaded. */
export function usePartTypeName(): (code: string) => string {
  const partTypes = usePartTypes();
  return (code) => partTypes.data?.find((p) => p.code === code)?.name ?? code;
}

/** A defect kind's name as the plant's catalogue gives it; its code until the catalogue has loaded. */
export function useDefectKindName(): (code: string) => string {
  const defectKinds = useDefectKinds();
  return (code) => defectKinds.data?.find((k) => k.code === code)?.name ?? code;
}

/** A reference photo's label in words: "good", "retake", "unlabelled" or "defective (Chip or notch)". */
export function useLabelWords(): (image: { label: string; defectKind: string | null }) => string {
  const kindName = useDefectKindName();
  return (image) => (image.label === 'defective' ? `defective${image.defectKind ? ` (${kindName(image.defectKind)})` : ''}` : image.label);
}

export function useReferenceSets() {
  return useQuery({ queryKey: referenceSetKeys.lists(), queryFn: ({ signal }) => listReferenceSets(signal) });
}

export function useReferenceSet(id: string) {
  return useQuery({ queryKey: referenceSetKeys.detail(id), queryFn: ({ signal }) => getReferenceSet(id, signal) });
}

export function useReferenceImages(setId: string | null, filters: ReferenceImageFilters) {
  return useQuery({
    queryKey: referenceSetKeys.imagePage(setId ?? '', filters),
    queryFn: ({ signal }) =>
      listReferenceImages(
        setId!,
        { label: filters.label ?? undefined, defectKind: filters.defectKind ?? undefined, limit: filters.limit, offset: filters.offset },
        signal,
      ),
    enabled: setId !== null,
    placeholderData: keepPreviousData,
  });
}

export function useCreateReferenceSet() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { name: string; partType: string; description: string }) => createReferenceSet(body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: referenceSetKeys.lists() }),
  });
}

export function useRelabelImages(setId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ imageIds, change }: { imageIds: string[]; change: LabelChange }) => relabelReferenceImages(setId, imageIds, change),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: referenceSetKeys.all }),
  });
}

/** After an upload batch: counts and pages of the set change. */
export function useRefreshReferenceSet(setId: string) {
  const queryClient = useQueryClient();
  return () => queryClient.invalidateQueries({ queryKey: referenceSetKeys.all }).then(() => queryClient.invalidateQueries({ queryKey: referenceSetKeys.detail(setId) }));
}
