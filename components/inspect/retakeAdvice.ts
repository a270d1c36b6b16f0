// What the operator can change when the quality gate asks for a new photo (DESIGN.md, "Image quality gate").
const ADVICE: Record<string, string> = {
  'out of focus': 'The photo is blurred. Hold the part still in the fixture and let the camera focus before taking it.',
  'over-exposed': 'Too much of the photo is pure white. Move the part out of the glare or dim the light.',
  'too dark': 'The photo is too dark. Check the station’s light and that nothing shades the part.',
  'wrong size': 'The photo is not the size this station’s camera takes, so its millimetres would be wrong. Take it with the station’s camera at its usual setting, not a copy or a crop.',
};

export function retakeAdvice(cause: string | null): string {
  return (cause && ADVICE[cause]) ?? 'The photo cannot be judged. Check the part’s position, the light and the focus, then take it again.';
}

/** The quality gate's own sentences (e.g. "out of focus: focus 12 is below 40"), when the server sent them. */
export function qualityProblems(quality: Record<string, unknown>): string[] {
  const problems = quality.problems;
  return Array.isArray(problems) ? problems.filter((p): p is string => typeof p === 'string') : [];
}
