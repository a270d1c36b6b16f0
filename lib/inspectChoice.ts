// The operator's station and rule, remembered on this device so the next shift starts where this one left off.
import { z } from 'zod';

const STORAGE_KEY = 'kernwright.inspect.choice';

const choiceSchema = z.object({ stationId: z.string(), ruleId: z.string() });
export type InspectChoice = z.infer<typeof choiceSchema>;

function storage(): Storage | null {
  try {
    return typeof window !== 'undefined' && window.localStorage ? window.localStorage : null;
  } catch {
    return null;
  }
}

export function readInspectChoice(): InspectChoice | null {
  const raw = storage()?.getItem(STORAGE_KEY);
  if (!raw) return null;
  try {
    const parsed = choiceSchema.safeParse(JSON.parse(raw));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

export function saveInspectChoice(choice: InspectChoice): void {
  storage()?.setItem(STORAGE_KEY, JSON.stringify(choice));
}
