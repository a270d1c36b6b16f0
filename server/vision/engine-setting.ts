// The server's engine setting: KW_ENGINE = auto (WebAssembly SIMD where it runs, else plain
// TypeScript), simd or plain. The worker pool hands it to every worker thread.
import { ENGINE_CHOICES, setEngine, type EngineChoice } from '../../shared/vision/engine';

export function engineSetting(env: NodeJS.ProcessEnv = process.env): EngineChoice {
  const value = env.KW_ENGINE ?? 'auto';
  if (!(ENGINE_CHOICES as readonly string[]).includes(value)) {
    throw new Error(`KW_ENGINE must be one of ${ENGINE_CHOICES.join(', ')}; got "${value}"`);
  }
  return value as EngineChoice;
}

/** Sets this thread's engine from KW_ENGINE. */
export function applyEngineSetting(env: NodeJS.ProcessEnv = process.env): EngineChoice {
  const choice = engineSetting(env);
  setEngine(choice);
  return choice;
}
