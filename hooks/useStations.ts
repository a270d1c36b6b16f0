// Lines and stations, with their calibration, through react-query.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { calibrateStation, createLine, createStation, listLines, updateStation } from '../lib/api';
import type { CalibrationRequest } from '../shared/api/stations';

export const stationKeys = {
  all: ['stations'] as const,
  lines: () => [...stationKeys.all, 'lines'] as const,
};

export function useLines() {
  return useQuery({ queryKey: stationKeys.lines(), queryFn: ({ signal }) => listLines(signal) });
}

function useStationMutation<A, R>(mutationFn: (args: A) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn, onSuccess: () => queryClient.invalidateQueries({ queryKey: stationKeys.all }) });
}

export function useCreateLine() {
  return useStationMutation((body: { name: string }) => createLine(body));
}

export function useCreateStation() {
  return useStationMutation((body: { lineId: string; name: string; cameraNote: string; partTypes: string[] }) => createStation(body));
}

export function useUpdateStation() {
  return useStationMutation(({ id, changes }: { id: string; changes: { name?: string; cameraNote?: string; active?: boolean; partTypes?: string[] } }) => updateStation(id, changes));
}

export function useCalibrateStation() {
  return useStationMutation(({ id, ...calibration }: { id: string } & CalibrationRequest) => calibrateStation(id, calibration));
}
