// The kernel library (built-in and engineers' own kernels), through react-query.
import { useMemo } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { KernelInfo } from '../shared/api/kernels';
import type { KernelLibrary } from '../shared/vision/pipeline';
import { createKernel, listKernels, type NewKernel } from '../lib/api';

export const kernelKeys = {
  all: ['kernels'] as const,
  list: () => [...kernelKeys.all, 'list'] as const,
};

export function useKernels() {
  return useQuery({ queryKey: kernelKeys.list(), queryFn: ({ signal }) => listKernels(signal), staleTime: 5 * 60_000 });
}

/** The library as the engine takes it: kernels by name. */
export function kernelLibraryOf(kernels: readonly KernelInfo[] | undefined): KernelLibrary {
  return new Map((kernels ?? []).map((k) => [k.name, k]));
}

export function useKernelLibrary(): KernelLibrary {
  const { data } = useKernels();
  return useMemo(() => kernelLibraryOf(data), [data]);
}

export function useSaveKernel() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: NewKernel) => createKernel(body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: kernelKeys.all }),
  });
}
