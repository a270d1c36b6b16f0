// The address of the records list filtered to the inspections behind a chart point, bar, station or alert.
import type { Href } from 'expo-router';

export interface RecordsLinkFilters {
  from: string;
  to: string;
  ruleId?: string;
  lineId?: string;
  stationId?: string;
  partType?: string;
  cause?: string;
  verdict?: 'PASS' | 'FAIL' | 'RETAKE';
}

export function recordsHref(filters: RecordsLinkFilters): Href {
  const params: Record<string, string> = {};
  for (const [key, value] of Object.entries(filters)) if (value) params[key] = value;
  return { pathname: '/records', params };
}
