// How the control chart draws each of its series; the legend and the plot read the same table.
import { colors } from '../../lib/theme';

export const CHART_LOOK = {
  share: { colour: colors.steel, radius: 5 },
  /** A signal is a larger square in the danger colour, never a colour change alone. */
  signal: { colour: colors.danger, size: 13 },
  centre: { colour: colors.notice, dash: undefined as number[] | undefined },
  limits: { colour: colors.caution, dash: [6, 4] as number[] },
  axis: colors.control,
  rules: colors.line,
} as const;

/** The y axis's top and its number of sections: the next of 1, 2, 2.5, 5 × 10^k above the largest value, so each label is a round number. */
export function niceAxis(largest: number): { max: number; sections: number } {
  if (!(largest > 0)) return { max: 1, sections: 5 };
  const power = 10 ** Math.floor(Math.log10(largest));
  for (const [step, sections] of [[1, 5], [2, 4], [2.5, 5], [5, 5], [10, 5]] as const) {
    if (step * power >= largest) return { max: step * power, sections };
  }
  return { max: 10 * power, sections: 5 };
}

